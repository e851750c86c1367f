/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_import.c: libFuzzer entry feeding one input to every importer. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"

/*
 * Build with clang (see DEVELOPERS.md, "Fuzzing the importers"):
 *   cmake -S . -B build-fuzz -DFUZZ=ON -DCMAKE_C_COMPILER=clang
 *   cmake --build build-fuzz --target fuzz_import
 *   ./build-fuzz/tests/fuzz_import -max_total_time=60 sample-site
 * Every parser must return one of its documented codes without crashing,
 * leaking or reading outside the buffer (ASan/UBSan watch that), and the
 * report must stay within its bounds.
 */

static enum errcode
any_target(void *ctx, const struct site_target *t, size_t line)
{
	(void)ctx;
	return (t->id[0] != '\0' && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static enum errcode
any_attempt(void *ctx, const struct site_attempt *a, size_t line)
{
	(void)ctx;
	return (a->end_mjd > a->start_mjd && line > 0) ? ERRCODE_OK :
	    ERRCODE_BAD_ARG;
}

static enum errcode
any_np(void *ctx, const struct import_crd_np *np, size_t line)
{
	(void)ctx;
	return (np->np.tof_s > 0.0 && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static enum errcode
any_eop(void *ctx, const struct site_eop_row *r, size_t line)
{
	(void)ctx;
	return (r->mjd > 0.0 && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static void
check_report(const struct import_report *rep)
{
	char buf[300];

	if (rep->nerrors > IMPORT_MAX_ERRORS || rep->nerrors > rep->bad + 1)
		__builtin_trap();
	for (size_t i = 0; i < rep->nerrors; i++) {
		import_error_format(rep, i, "fuzz", buf, sizeof buf);
		if (memchr(rep->errors[i].message, '\0',
		    sizeof rep->errors[i].message) == NULL)
			__builtin_trap();
	}
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	const char *buf = (const char *)data;
	struct import_report rep;
	struct site_station st;

	import_station_ini(buf, size, &st, &rep);
	check_report(&rep);
	import_targets_csv(buf, size, any_target, NULL, &rep);
	check_report(&rep);
	import_attempts_csv(buf, size, any_attempt, NULL, &rep);
	check_report(&rep);
	import_crd(buf, size, any_np, NULL, &rep);
	check_report(&rep);
	import_eop_finals(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	import_eop_c04(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	import_eop(buf, size, any_eop, NULL, &rep);
	check_report(&rep);
	return 0;
}
