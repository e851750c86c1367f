/* SPDX-License-Identifier: BSD-3-Clause */
/* main.c: program entry; installs the allocator and runs a subcommand. */
#include "cli/cli.h"
#include "core/mem.h"
#include "formats/render_json.h"

int
main(int argc, char **argv)
{
	render_json_setup();
	return cli_main(argc, argv);
}
