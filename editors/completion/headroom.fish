# fish completion for headroom: commands, options, the kinds of
# `headroom new`, formats and calc files. Installed by `make install` as
# share/fish/vendor_completions.d/headroom.fish.

set -l commands check build watch new diff convert lsp
complete -c headroom -f
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a check -d 'Evaluate; print diagnostics and the checks'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a build -d 'Write the report'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a watch -d 'Build the report again on every save'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a new -d 'Write a commented starter calc'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a diff -d 'What changed in meaning between two revisions'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a convert -d 'Convert a value between units'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -a lsp -d 'A Language Server Protocol server'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -l help -d 'Show the usage'
complete -c headroom -n "not __fish_seen_subcommand_from $commands" -l version -d 'Show the version'

# calc files for the commands that read them
complete -c headroom -n "__fish_seen_subcommand_from check build watch diff" -k -a "(__fish_complete_suffix .md)"
complete -c headroom -n "__fish_seen_subcommand_from check build watch new diff lsp convert" -l help -d 'Show the usage'
complete -c headroom -n "__fish_seen_subcommand_from check" -l format -x -a "text json junit sarif github" -d 'What to print'
complete -c headroom -n "__fish_seen_subcommand_from check" -l json -d 'The JSON results'
complete -c headroom -n "__fish_seen_subcommand_from build" -l format -x -a "pdf text json" -d 'The report format'
complete -c headroom -n "__fish_seen_subcommand_from build watch" -s o -r -F -d 'The report file'
complete -c headroom -n "__fish_seen_subcommand_from build" -l strict -d 'Exit 1 when a check fails'
complete -c headroom -n "__fish_seen_subcommand_from build" -l since -r -F -d 'Mark the changes since an earlier revision'
complete -c headroom -n "__fish_seen_subcommand_from diff" -l json -d 'The changes as JSON'
complete -c headroom -n "__fish_seen_subcommand_from diff" -l rel-tol -x -d 'Relative tolerance for results'
complete -c headroom -n "__fish_seen_subcommand_from new; and not __fish_seen_subcommand_from package riser pump-line pipe-rating" -a "package riser pump-line pipe-rating" -d 'Starter kind'
complete -c headroom -n "__fish_seen_subcommand_from new; and __fish_seen_subcommand_from package" -a "(__fish_complete_directories)" -d 'Folder of the package'
