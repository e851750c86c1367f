/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_attempts_csv.c: the attempts CSV (import_attempts_csv) as log
   import reads it, each row then through the one validation of an
   attempt (attempt_check): what it accepts holds only safe text. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "core/attempt.h"
#include "core/text.h"
#include "formats/import.h"
#include "fuzz_common.h"

static enum errcode
row(void *ctx, const struct site_attempt *a, size_t line)
{
	(void)ctx;
	if (line == 0)
		__builtin_trap();
	if (attempt_check(a, 20.0, NULL, NULL, 0) == ERRCODE_OK &&
	    (text_unsafe_at(a->operator_name, strlen(a->operator_name), 0) !=
	    strlen(a->operator_name) || text_unsafe_at(a->notes,
	    strlen(a->notes), 1) != strlen(a->notes) ||
	    a->normal_points > a->returns))
		__builtin_trap();
	return ERRCODE_OK;
}

FUZZ_IMPORTER(import_attempts_csv, row)
