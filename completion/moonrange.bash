# SPDX-License-Identifier: BSD-3-Clause
# moonrange.bash: bash completion for moonrange: commands, actions,
# options, the words an option takes and the target ids of the database
# given with --db.  The candidates come from the program itself
# ('moonrange __complete WORDS...', made from its command table), so they
# never fall behind it.  Installed as
# share/bash-completion/completions/moonrange.
_moonrange()
{
	local cur out
	local -a words
	cur=${COMP_WORDS[COMP_CWORD]}
	words=("${COMP_WORDS[@]:1:COMP_CWORD-1}")
	out=$("${COMP_WORDS[0]}" __complete "${words[@]}" 2>/dev/null) || return 0
	if [[ $out == *__files__* ]]; then
		out=${out//__files__/}
		compopt -o filenames 2>/dev/null
		mapfile -t COMPREPLY < <(compgen -f -- "$cur"; compgen -W "$out" -- "$cur")
	else
		mapfile -t COMPREPLY < <(compgen -W "$out" -- "$cur")
	fi
	return 0
}
complete -F _moonrange moonrange
