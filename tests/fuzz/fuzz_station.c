/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_station.c: the station file (import_station_ini), as station import reads it. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct import_report rep;
	struct site_station st;

	import_station_ini((const char *)data, size, &st, &rep);
	check_report(&rep);
	return 0;
}
