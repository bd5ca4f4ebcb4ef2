" Vim syntax file for headroom calc files (*.calc.md).
" Markdown, with the fenced blocks headroom evaluates (info string calc,
" path, cases, curve, network) highlighted as statements: keywords, names
" called as functions, numbers, strings, operators, comments, [citations]
" and the option lines and pipes of the tables. Installed by `make install`
" under share/vim/vimfiles and share/nvim/site.
if exists("b:current_syntax")
  finish
endif

runtime! syntax/markdown.vim
unlet! b:current_syntax

syn case match
syn region headroomFence matchgroup=headroomFenceDelim
      \ start=/^\s*\z(`\{3,}\|\~\{3,}\)\s*\%(calc\|path\|cases\|curve\|network\)\>.*$/
      \ end=/^\s*\z1\s*$/ keepend contains=@headroomStatement

syn cluster headroomStatement contains=headroomComment,headroomKeyword,headroomNumber,headroomString,
      \headroomCall,headroomOperator,headroomTable,headroomOption,headroomConstant
syn match   headroomComment  /#.*$/ contained contains=headroomCite
syn match   headroomCite     /\[[A-Za-z0-9_.-]\+\]/ contained
syn keyword headroomKeyword  contained check solve where between and as figure show
syn keyword headroomConstant contained pi g
syn match   headroomNumber   /\%(\<\|\.\)\d\+\%(\.\d*\)\=\%([eE][+-]\=\d\+\)\=/ contained
syn region  headroomString   start=/"/ skip=/\\"/ end=/"/ contained oneline
syn match   headroomCall     /\<[A-Za-z_][A-Za-z_0-9]*\ze\s*(/ contained
syn match   headroomOperator /[-+*\/^=<>·]/ contained
syn match   headroomTable    /|/ contained
syn match   headroomOption   /^\s*[A-Za-z_]\+\ze:\%(\s\|$\)/ contained

hi def link headroomFenceDelim Delimiter
hi def link headroomComment    Comment
hi def link headroomCite       Special
hi def link headroomKeyword    Keyword
hi def link headroomConstant   Constant
hi def link headroomNumber     Number
hi def link headroomString     String
hi def link headroomCall       Function
hi def link headroomOperator   Operator
hi def link headroomTable      Delimiter
hi def link headroomOption     Identifier

let b:current_syntax = "headroom"
