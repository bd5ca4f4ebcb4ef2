# bash completion for headroom: commands, their options, the kinds of
# `headroom new` (a folder after `new package`), the formats of --format,
# and calc files (*.calc.md, *.md).
# Installed by `make install` as share/bash-completion/completions/headroom;
# it needs nothing from the bash-completion package.

_headroom_files()
{
    local IFS=$'\n'
    COMPREPLY+=($(compgen -f -X '!*.md' -- "$1") $(compgen -d -S / -- "$1"))
}

_headroom()
{
    local cur=${COMP_WORDS[COMP_CWORD]} prev=${COMP_WORDS[COMP_CWORD-1]}
    local commands="check build watch new diff convert lsp"
    COMPREPLY=()
    if [ "$COMP_CWORD" -eq 1 ]; then
        COMPREPLY=($(compgen -W "$commands --help --version" -- "$cur"))
        return
    fi
    local cmd=${COMP_WORDS[1]}
    case "$cmd:$prev" in
    check:--format) COMPREPLY=($(compgen -W "text json junit sarif github" -- "$cur")); return ;;
    build:--format) COMPREPLY=($(compgen -W "pdf text json" -- "$cur")); return ;;
    build:-o | watch:-o | build:--since) _headroom_files "$cur"; COMPREPLY+=($(compgen -f -- "$cur")); return ;;
    diff:--rel-tol) return ;;
    esac
    case "$cmd" in
    check)
        [[ $cur == -* ]] && COMPREPLY=($(compgen -W "--format --json --help" -- "$cur")) || _headroom_files "$cur" ;;
    build)
        [[ $cur == -* ]] && COMPREPLY=($(compgen -W "-o --format --strict --since --help" -- "$cur")) || _headroom_files "$cur" ;;
    watch)
        [[ $cur == -* ]] && COMPREPLY=($(compgen -W "-o --help" -- "$cur")) || _headroom_files "$cur" ;;
    diff)
        [[ $cur == -* ]] && COMPREPLY=($(compgen -W "--json --rel-tol --help" -- "$cur")) || _headroom_files "$cur" ;;
    new)
        if [ "$COMP_CWORD" -eq 2 ]; then
            COMPREPLY=($(compgen -W "package riser pump-line pipe-rating --help" -- "$cur"))
        elif [ "${COMP_WORDS[2]}" = package ]; then
            COMPREPLY=($(compgen -d -S / -- "$cur"))
        else
            _headroom_files "$cur"
        fi ;;
    lsp) COMPREPLY=($(compgen -W "--help" -- "$cur")) ;;
    convert) [ "$COMP_CWORD" -eq 2 ] && COMPREPLY=($(compgen -W "--help" -- "$cur")) ;;
    esac
}

complete -o filenames -F _headroom headroom
