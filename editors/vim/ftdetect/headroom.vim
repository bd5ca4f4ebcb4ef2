" headroom calc files (*.calc.md): Markdown with calc fences.
autocmd BufRead,BufNewFile *.calc.md set filetype=headroom
