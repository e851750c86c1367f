/* SPDX-License-Identifier: BSD-3-Clause */
/* main.c: program entry; installs the allocator and runs a subcommand. */
#include "cli.h"
#include "mem.h"

int
main(int argc, char **argv)
{
	mem_install();
	return cli_main(argc, argv);
}
