" Vim compiler file for nodal: ":compiler nodal" then ":make".
" Findings are "file:line:col: severity: message [rule]"; the summary
" line nodal prints on standard error is not one and is left out.

if exists('current_compiler')
  finish
endif
let current_compiler = 'nodal'

let s:cpo_save = &cpo
set cpo&vim

" --no-color keeps escape codes out even when Vim runs nodal on a terminal.
CompilerSet makeprg=nodal\ check\ --no-color\ %:S
" %t takes the first letter of the severity: e(rror), w(arning), n(ote).
CompilerSet errorformat=%f:%l:%c:\ %trror:\ %m,%f:%l:%c:\ %tarning:\ %m,%f:%l:%c:\ %tote:\ %m,%-G%.%#

let &cpo = s:cpo_save
unlet s:cpo_save
