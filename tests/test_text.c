/* SPDX-License-Identifier: BSD-3-Clause */
/* test_text.c: the strict number and boolean parsers, error sentences and
   UTF-8 checks of core/text.c, table-driven.  Expected values follow from
   the grammar in text.h (C11 7.22.1.3 for what strtod would also take). */
#include <string.h>

#include "check.h"
#include "core/text.h"

static void
test_text_real_table(void **state)
{
	static const struct { const char *s; int ok; double v; } cases[] = {
		{ "1", 1, 1.0 }, { "-2.5", 1, -2.5 }, { "+.5", 1, 0.5 },
		{ "3.", 1, 3.0 }, { "1e3", 1, 1000.0 }, { "2.5E-1", 1, 0.25 },
		{ "0x10", 0, 0 }, { "inf", 0, 0 }, { "nan", 0, 0 },
		{ " 1", 0, 0 }, { "1 ", 0, 0 }, { "", 0, 0 }, { ".", 0, 0 },
		{ "1e", 0, 0 }, { "1e999", 0, 0 }, { "--1", 0, 0 },
		{ "1,5", 0, 0 },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		double v = -999;
		enum errcode rc = text_parse_real(cases[i].s, -1e9, 1e9, &v);

		if (cases[i].ok) {
			assert_int_equal(rc, ERRCODE_OK);
			assert_true(v == cases[i].v);
		} else {
			assert_int_equal(rc, ERRCODE_BAD_ARG);
			assert_true(v == -999);
		}
	}
	{
		double v;

		assert_int_equal(text_parse_real("10", 0, 9, &v),
		    ERRCODE_BAD_ARG);
		assert_int_equal(text_parse_real("9", 0, 9, &v), ERRCODE_OK);
	}
}

static void
test_text_long_table(void **state)
{
	static const struct { const char *s; int ok; long v; } cases[] = {
		{ "0", 1, 0 }, { "-7", 1, -7 }, { "+12", 1, 12 },
		{ "0x10", 0, 0 }, { "1.0", 0, 0 }, { "1e2", 0, 0 },
		{ " 3", 0, 0 }, { "3 ", 0, 0 }, { "", 0, 0 }, { "-", 0, 0 },
		{ "99999999999999999999999", 0, 0 },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		long v = -999;
		enum errcode rc = text_parse_long(cases[i].s, -1000, 1000, &v);

		assert_int_equal(rc, cases[i].ok ? ERRCODE_OK :
		    ERRCODE_BAD_ARG);
		assert_true(v == (cases[i].ok ? cases[i].v : -999));
	}
}

static void
test_text_bool_any_case(void **state)
{
	static const struct { const char *s; int rc, v; } cases[] = {
		{ "YES", 0, 1 }, { "yes", 0, 1 }, { "True", 0, 1 },
		{ "1", 0, 1 }, { "on", 0, 1 }, { "No", 0, 0 },
		{ "FALSE", 0, 0 }, { "0", 0, 0 }, { "off", 0, 0 },
		{ "y", 1, 0 }, { "", 1, 0 }, { "2", 1, 0 }, { "yes ", 1, 0 },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		int v = -1;
		enum errcode rc = text_parse_bool(cases[i].s, &v);

		if (cases[i].rc == 0) {
			assert_int_equal(rc, ERRCODE_OK);
			assert_int_equal(v, cases[i].v);
		} else {
			assert_int_equal(rc, ERRCODE_BAD_ARG);
			assert_int_equal(v, -1);
		}
	}
}

/* The name-to-enum lookup: exact, case-sensitive, NULL and unknown -1
   (expected values follow from the table; common practice for enum
   names). */
static void
test_text_name_index(void **state)
{
	static const char *const names[] = { "greedy", "best", "" };

	(void)state;
	assert_int_equal(text_name_index("greedy", names, 3), 0);
	assert_int_equal(text_name_index("best", names, 3), 1);
	assert_int_equal(text_name_index("", names, 3), 2);
	assert_int_equal(text_name_index("Best", names, 3), -1);
	assert_int_equal(text_name_index("bestx", names, 3), -1);
	assert_int_equal(text_name_index("best", names, 1), -1);
	assert_int_equal(text_name_index(NULL, names, 3), -1);
	assert_int_equal(text_name_index("greedy", names, 0), -1);
}

static void
test_text_err_cuts_at_characters(void **state)
{
	char buf[8];

	(void)state;
	/* "ab" + U+00E9 (2 bytes) x3 = 8 bytes: cut to 7 must drop the
	   half character. */
	assert_int_equal(text_err(ERRCODE_BAD_ARG, buf, sizeof buf, "ab%s",
	    "\xc3\xa9\xc3\xa9\xc3\xa9"), ERRCODE_BAD_ARG);
	assert_string_equal(buf, "ab\xc3\xa9\xc3\xa9");
	/* Bytes that are not UTF-8 are cut away with what follows. */
	text_err(ERRCODE_BAD_ARG, buf, sizeof buf, "x%cy", 0x8E);
	assert_string_equal(buf, "x");
	/* NULL buffer: only the code comes back. */
	assert_int_equal(text_err(ERRCODE_NOMEM, NULL, 0, "x"),
	    ERRCODE_NOMEM);
}

static void
test_text_utf8_table(void **state)
{
	static const struct { const char *s; int ok; } cases[] = {
		{ "plain", 1 }, { "\xc3\xa9", 1 }, { "\xe2\x82\xac", 1 },
		{ "\xf0\x9f\x8c\x95", 1 }, { "\xc0\xaf", 0 },	/* overlong */
		{ "\xed\xa0\x80", 0 },	/* surrogate */
		{ "\xf4\x90\x80\x80", 0 },	/* above U+10FFFF */
		{ "\xe2\x82", 0 }, { "\xff", 0 },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
		assert_int_equal(text_utf8_valid(cases[i].s,
		    strlen(cases[i].s)), cases[i].ok);
}

/* Unsafe characters of stored text (text.h's list; code points from
   The Unicode Standard, C0/C1 controls and the bidi formatting set). */
static void
test_text_unsafe_table(void **state)
{
	static const struct { const char *s; int nl; size_t at; } cases[] = {
		{ "plain", 0, 5 }, { "Ren\xc3\xa9" "e", 0, 6 },
		{ "a\tb", 0, 1 }, { "a\nb", 0, 1 }, { "a\nb", 1, 3 },
		{ "a\rb", 1, 1 }, { "a\x7f", 0, 1 }, { "ab\xc2\x85", 0, 2 },
		{ "\xc2\xa0", 0, 2 },			/* U+00A0: fine */
		{ "x\xe2\x80\xae", 0, 1 },		/* U+202E RLO */
		{ "x\xe2\x80\xaa", 0, 1 },		/* U+202A LRE */
		{ "x\xe2\x80\xaf", 0, 4 },		/* U+202F: fine */
		{ "x\xe2\x81\xa6", 0, 1 },		/* U+2066 LRI */
		{ "x\xe2\x81\xa9", 0, 1 },		/* U+2069 PDI */
		{ "x\xe2\x81\xaa", 0, 4 },		/* U+206A: fine */
		{ "ok\xff", 0, 2 }, { "\xc0\xaf", 0, 0 },
		{ "\xed\xa0\x80", 0, 0 },		/* a surrogate */
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++)
		assert_int_equal(text_unsafe_at(cases[i].s,
		    strlen(cases[i].s), cases[i].nl), cases[i].at);
}

static void
test_text_quote_valid_utf8(void **state)
{
	char out[16];

	(void)state;
	assert_string_equal(text_quote("a\xff" "b\n", 4, out, sizeof out),
	    "a\\xFFb\\x0A");
	assert_string_equal(text_quote("Ren\xc3\xa9", 5, out, sizeof out),
	    "Ren\xc3\xa9");
	/* A cut never splits an escape or a character. */
	assert_string_equal(text_quote("\xff\xff\xff\xff", 4, out, 10),
	    "\\xFF\\xFF");
	assert_string_equal(text_quote("abcdefg\xc3\xa9", 9, out, 9),
	    "abcdefg");
	assert_true(text_utf8_valid(out, strlen(out)));
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_text_real_table),
		cmocka_unit_test(test_text_long_table),
		cmocka_unit_test(test_text_bool_any_case),
		cmocka_unit_test(test_text_name_index),
		cmocka_unit_test(test_text_err_cuts_at_characters),
		cmocka_unit_test(test_text_utf8_table),
		cmocka_unit_test(test_text_unsafe_table),
		cmocka_unit_test(test_text_quote_valid_utf8),
	};

	return cmocka_run_group_tests_name("text", tests, NULL, NULL);
}
