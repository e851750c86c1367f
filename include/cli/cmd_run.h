/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_run.h: the run functions of the commands (daemon/cli/cmd_<name>.c)
   and their help made at run time, named in the command table
   (daemon/cli/cli_table.c). */
#ifndef MOONRANGE_CMD_RUN_H
#define MOONRANGE_CMD_RUN_H

#include <stdio.h>

#include "cli/cli.h"

/*
 * Each has the type the table's field wants (cli/cli.h), in the order of
 * the table.  A cli_run_fn gets the arguments the table has parsed and
 * checked (cli_args.c) and returns the exit status, having printed its
 * output or one error line; where one function serves several actions,
 * a->cmd->mode (the table's .mode) says which: station show and set (1),
 * target set, retire (1) and add (2), log list and export (1), eop status
 * and import (1).  A cli_store_job works on the database the table has
 * opened (ctx NULL).  A cli_more_fn prints the help that follows the
 * options (.more).
 */
cli_run_fn cmd_ephem, cmd_phases, cmd_eclipses, cmd_windows, cmd_tonight,
    cmd_plan, cmd_coverage, cmd_init, cmd_station, cmd_target_write,
    cmd_blackout_add, cmd_blackout_remove, cmd_log_add, cmd_log_list,
    cmd_log_import, cmd_np_import, cmd_np_count, cmd_eop, cmd_serve,
    cmd_demo, cmd_bench;
cli_store_job cmd_target_list, cmd_blackout_list, cmd_setting_list,
    cmd_setting_set;
cli_more_fn cmd_windows_more, cmd_init_more, cmd_station_more,
    cmd_setting_more, cmd_log_import_more, cmd_serve_more;

#endif
