/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_common.h: what the libFuzzer harnesses of tests/fuzz share: the
   importers' row callbacks and the report check. */
#ifndef MOONRANGE_FUZZ_COMMON_H
#define MOONRANGE_FUZZ_COMMON_H

#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"

/*
 * Build with clang and run (DEVELOPERS.md, "Fuzzing"):
 *   cmake -S . -B build-fuzz -DFUZZ=ON -DCMAKE_C_COMPILER=clang
 *   cmake --build build-fuzz -j2 --target fuzz_all
 *   bash tests/fuzz/run.sh build-fuzz 600     # 10 minutes each
 * Every parser must return one of its documented codes without crashing,
 * leaking or reading outside the buffer (ASan/UBSan watch that), and the
 * report must stay within its bounds.
 */

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static inline enum errcode
any_target(void *ctx, const struct site_target *t, size_t line)
{
	(void)ctx;
	return (t->id[0] != '\0' && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static inline enum errcode
any_attempt(void *ctx, const struct site_attempt *a, size_t line)
{
	(void)ctx;
	return (a->end_mjd > a->start_mjd && line > 0) ? ERRCODE_OK :
	    ERRCODE_BAD_ARG;
}

static inline enum errcode
any_np(void *ctx, const struct import_crd_np *np, size_t line)
{
	(void)ctx;
	return (np->np.tof_s > 0.0 && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static inline enum errcode
any_eop(void *ctx, const struct site_eop_row *r, size_t line)
{
	(void)ctx;
	return (r->mjd > 0.0 && line > 0) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static inline void
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

/*
 * The entry point of a harness that feeds the input to one row-by-row
 * importer (import_crd, import_targets_csv, ...) with the row callback cb,
 * then checks the report.
 */
#define FUZZ_IMPORTER(importer, cb)					\
	int								\
	LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)	\
	{								\
		struct import_report rep;				\
									\
		importer((const char *)data, size, (cb), NULL, &rep);	\
		check_report(&rep);					\
		return 0;						\
	}

#endif
