/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_utc.c: the UTC parser (tscale_parse_utc) with a round-trip
   property: a time it accepts, formatted with 6 decimals, parses again
   and formats to the same text. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "core/tscale.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	char in[64], f1[40], f2[40];
	double u1, u2, v1, v2;

	if (size >= sizeof in)
		return 0;
	memcpy(in, data, size);
	in[size] = '\0';
	if (tscale_parse_utc(in, &u1, &u2, f1, sizeof f1) != ERRCODE_OK)
		return 0;
	if (tscale_format_utc(u1, u2, 6, f1, sizeof f1) != ERRCODE_OK)
		return 0;	/* outside years 0-9999: formatting refuses */
	if (tscale_parse_utc(f1, &v1, &v2, NULL, 0) != ERRCODE_OK ||
	    tscale_format_utc(v1, v2, 6, f2, sizeof f2) != ERRCODE_OK ||
	    strcmp(f1, f2) != 0)
		__builtin_trap();
	return 0;
}
