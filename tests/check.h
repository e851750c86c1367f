/* SPDX-License-Identifier: BSD-3-Clause */
/* check.h: numeric assertions over cmocka that print want, got and error. */
#ifndef MOONRANGE_TESTS_CHECK_H
#define MOONRANGE_TESTS_CHECK_H

#include <math.h>
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <stdio.h>
#include <cmocka.h>

/*
 * check_near(got, want, tol, unit, what): fail unless |got - want| <= tol,
 * printing all three (after ERFA's vvd).  Every call site names the source
 * of `want` in a comment beside it.
 */
#define check_near(got, want, tol, unit, what)                               \
	check_near_at((got), (want), (tol), (unit), (what), __FILE__, __LINE__)

static inline void
check_near_at(double got, double want, double tol, const char *unit,
    const char *what, const char *file, int line)
{
	double d = got - want;

	if (!(fabs(d) <= tol)) {
		print_error("%s:%d: %s: want %.12g %s, got %.12g %s, "
		    "difference %.3g %s exceeds %.3g %s\n", file, line, what,
		    want, unit, got, unit, d, unit, tol, unit);
		fail();
	}
}

/* Wrap an angle difference into -180..180 degrees. */
static inline double
check_wrap180(double d)
{
	d = fmod(d, 360.0);
	if (d > 180.0)
		d -= 360.0;
	if (d < -180.0)
		d += 360.0;
	return d;
}

#endif
