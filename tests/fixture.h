/* SPDX-License-Identifier: BSD-3-Clause */
/* fixture.h: fixtures shared by the cmocka programs: a scratch directory
   for a group of tests, made by its setup and removed by its teardown. */
#ifndef MOONRANGE_TESTS_FIXTURE_H
#define MOONRANGE_TESTS_FIXTURE_H

#include <stdio.h>
#include <stdlib.h>
#include <unistd.h>

/* The group's scratch directory (under $TMPDIR, else /tmp). */
static char fixture_dir[256];

/* Group setup: make fixture_dir; 0 or -1 as cmocka wants. */
static inline int
fixture_dir_setup(void **state)
{
	const char *base = getenv("TMPDIR");

	(void)state;
	snprintf(fixture_dir, sizeof fixture_dir, "%s/moonrange-test-XXXXXX",
	    base != NULL && *base ? base : "/tmp");
	return mkdtemp(fixture_dir) != NULL ? 0 : -1;
}

/* Group teardown: remove fixture_dir and all in it. */
static inline int
fixture_dir_teardown(void **state)
{
	char cmd[300];

	(void)state;
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", fixture_dir);
	return system(cmd) == 0 ? 0 : -1;
}

#endif
