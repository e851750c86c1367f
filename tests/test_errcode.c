/* SPDX-License-Identifier: BSD-3-Clause */
/* test_errcode.c: every status code has its own message and name. */
#include <string.h>

#include "check.h"
#include "core/errcode.h"

static void
test_errcode_every_code_has_own_text(void **state)
{
	(void)state;
	for (int i = 0; i < ERRCODE__LAST; i++) {
		const char *s = errcode_str((enum errcode)i);
		const char *n = errcode_name((enum errcode)i);

		assert_non_null(s);
		assert_non_null(n);
		assert_string_not_equal(s, "unknown error");
		assert_string_not_equal(n, "unknown");
		for (int j = 0; j < i; j++) {
			assert_string_not_equal(s, errcode_str((enum errcode)j));
			assert_string_not_equal(n, errcode_name((enum errcode)j));
		}
	}
}

/* The split of errcode.h's list: the program's failures, and the
   caller's (what the CLI's exit status 1 or 2 follows). */
static void
test_errcode_internal_split(void **state)
{
	static const enum errcode internal[] = {ERRCODE_NOMEM, ERRCODE_DB,
	    ERRCODE_IO, ERRCODE_NO_CONVERGE, ERRCODE__LAST};
	static const enum errcode input[] = {ERRCODE_OK, ERRCODE_BAD_ARG,
	    ERRCODE_BAD_TIME, ERRCODE_CONFIG, ERRCODE_NOT_FOUND,
	    ERRCODE_EXISTS, ERRCODE_AUTH, ERRCODE_TOO_LARGE,
	    ERRCODE_UNSUPPORTED, ERRCODE_METHOD};

	(void)state;
	for (size_t i = 0; i < sizeof internal / sizeof internal[0]; i++)
		assert_int_equal(errcode_is_internal(internal[i]), 1);
	for (size_t i = 0; i < sizeof input / sizeof input[0]; i++)
		assert_int_equal(errcode_is_internal(input[i]), 0);
	assert_int_equal((sizeof internal + sizeof input) /
	    sizeof internal[0], ERRCODE__LAST + 1);
}

static void
test_errcode_ok_is_zero(void **state)
{
	(void)state;
	assert_int_equal(ERRCODE_OK, 0);
	assert_string_equal(errcode_name(ERRCODE_OK), "ok");
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_errcode_every_code_has_own_text),
		cmocka_unit_test(test_errcode_internal_split),
		cmocka_unit_test(test_errcode_ok_is_zero),
	};

	return cmocka_run_group_tests_name("errcode", tests, NULL, NULL);
}
