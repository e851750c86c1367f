/* SPDX-License-Identifier: BSD-3-Clause */
/* rng.h: the deterministic generator of the randomised test cases (64-bit
   linear congruential, Knuth's MMIX constants). */
#ifndef MOONRANGE_TESTS_RNG_H
#define MOONRANGE_TESTS_RNG_H

/* The next uniform deviate in (0, 1) from *state. */
static inline double
rng_next(unsigned long long *state)
{
	*state = *state * 6364136223846793005ULL + 1442695040888963407ULL;
	return ((double)(*state >> 11) + 0.5) / 9007199254740992.0;
}

/* A file's generator: rng_state from seed, and urand() drawing from it. */
#define RNG_FILE(seed)							\
	static unsigned long long rng_state = (seed);			\
	static double urand(void) { return rng_next(&rng_state); }

#endif
