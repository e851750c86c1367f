/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_targets_csv.c: the targets CSV (import_targets_csv), as target import reads it. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct import_report rep;

	import_targets_csv((const char *)data, size, any_target, NULL, &rep);
	check_report(&rep);
	return 0;
}
