/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_iers.c: the IERS importers (finals2000A, EOP 14 C04 and the detecting import_eop), as eop import reads them. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	const char *buf = (const char *)data;
	struct import_report rep;

	import_eop_finals(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	import_eop_c04(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	import_eop(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	return 0;
}
