/* SPDX-License-Identifier: BSD-3-Clause */
/* test_mem.c: the allocation wrapper, its failure switch and text buffers. */
#include <string.h>

#include "check.h"
#include "core/mem.h"

static void
test_mem_fail_after_counts_and_fails_nth(void **state)
{
	void *a, *b, *c;

	(void)state;
	(void)mem_fail_after(0);
	a = mem_alloc(10);
	assert_non_null(a);
	assert_int_equal(mem_fail_after(2), 1);	/* one allocation counted */
	b = mem_alloc(10);			/* 1st: succeeds */
	assert_non_null(b);
	c = mem_calloc(2, 8);			/* 2nd: fails */
	assert_null(c);
	c = mem_realloc(NULL, 8);		/* switch is spent */
	assert_non_null(c);
	assert_int_equal(mem_fail_after(0), 3);
	mem_free(a);
	mem_free(b);
	mem_free(c);
	mem_free(NULL);
}

static void
test_mem_strdup(void **state)
{
	char *s;

	(void)state;
	assert_null(mem_strdup(NULL));
	s = mem_strdup("moonrange");
	assert_non_null(s);
	assert_string_equal(s, "moonrange");
	mem_free(s);
	(void)mem_fail_after(1);
	assert_null(mem_strdup("x"));
	(void)mem_fail_after(0);
}

static void
test_mem_mbuf_appends_and_grows(void **state)
{
	struct mbuf b;
	char *p;

	(void)state;
	mbuf_init(&b);
	mbuf_puts(&b, "az ");
	mbuf_printf(&b, "%.2f deg", 123.456);
	mbuf_add(&b, "!!", 1);
	assert_int_equal(mbuf_status(&b), ERRCODE_OK);
	assert_string_equal(b.data, "az 123.46 deg!");
	assert_int_equal(b.len, strlen("az 123.46 deg!"));
	/* growth past the first 256 bytes keeps every byte */
	for (int i = 0; i < 1000; i++)
		mbuf_printf(&b, "%d,", i % 10);
	assert_int_equal(mbuf_status(&b), ERRCODE_OK);
	assert_int_equal(b.len, strlen("az 123.46 deg!") + 2000);
	assert_int_equal(b.data[b.len], '\0');
	p = mbuf_take(&b);
	assert_non_null(p);
	assert_null(b.data);
	assert_int_equal(b.len, 0);
	assert_memory_equal(p, "az 123.46 deg!0,1,", 18);
	mem_free(p);
	mbuf_free(&b);
}

static void
test_mem_mbuf_take_of_empty_buffer(void **state)
{
	struct mbuf b;
	char *p;

	(void)state;
	mbuf_init(&b);
	p = mbuf_take(&b);
	assert_non_null(p);
	assert_string_equal(p, "");
	mem_free(p);
}

/* A failed append marks the buffer; later appends are ignored and the
   status reads ERRCODE_NOMEM; the buffer is still freed cleanly. */
static void
test_mem_mbuf_failure_is_sticky(void **state)
{
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	mbuf_puts(&b, "first");
	assert_int_equal(mbuf_status(&b), ERRCODE_OK);
	{
		char big[300];

		memset(big, 'x', sizeof big);
		(void)mem_fail_after(1);
		mbuf_add(&b, big, sizeof big);	/* past 256: realloc fails */
		(void)mem_fail_after(0);
	}
	assert_int_equal(mbuf_status(&b), ERRCODE_NOMEM);
	assert_string_equal(b.data, "first");	/* old contents intact */
	mbuf_puts(&b, "more");			/* ignored once failed */
	assert_string_equal(b.data, "first");
	assert_null(mbuf_take(&b));		/* take of a failed buffer */
	assert_null(b.data);
	mbuf_free(&b);
}

static void
test_mem_mbuf_first_allocation_fails(void **state)
{
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	(void)mem_fail_after(1);
	mbuf_printf(&b, "%s", "x");
	(void)mem_fail_after(0);
	assert_int_equal(mbuf_status(&b), ERRCODE_NOMEM);
	assert_null(b.data);
	mbuf_free(&b);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_mem_fail_after_counts_and_fails_nth),
		cmocka_unit_test(test_mem_strdup),
		cmocka_unit_test(test_mem_mbuf_appends_and_grows),
		cmocka_unit_test(test_mem_mbuf_take_of_empty_buffer),
		cmocka_unit_test(test_mem_mbuf_failure_is_sticky),
		cmocka_unit_test(test_mem_mbuf_first_allocation_fails),
	};

	return cmocka_run_group_tests_name("mem", tests, NULL, NULL);
}
