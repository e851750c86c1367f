/* SPDX-License-Identifier: BSD-3-Clause */
/* sample_targets.h: the eight invented targets of the night-plan tests and
   benchmark: the five of sample-site/targets.csv and three more. */
#ifndef MOONRANGE_TESTS_SAMPLE_TARGETS_H
#define MOONRANGE_TESTS_SAMPLE_TARGETS_H

/* Rows {id, selenographic lat deg, lon deg, height m, strength}. */
#define SAMPLE_TARGETS_N 8
#define SAMPLE_TARGETS {						\
	{"HERON", 12.4817, -21.3764, -1180, 1.00},			\
	{"OSPREY", -8.7231, 31.6402, -2310, 0.45},			\
	{"PLOVER", 24.1538, 8.9317, -640, 0.30},			\
	{"SANDPIPER", -17.0622, -36.8115, 420, 0.55},			\
	{"TERN", 3.2719, 40.1206, -1530, 0.20},				\
	{"AVOCET", 35.0, -5.0, 0, 0.40},				\
	{"DUNLIN", -30.0, 15.0, 0, 0.35},				\
	{"EGRET", 0.5, 60.0, 0, 0.25},					\
}

#endif
