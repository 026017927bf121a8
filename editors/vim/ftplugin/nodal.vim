" Vim file-type plugin for nodal (*.nodal): comments, indentation, and
" :make running "nodal check" on the file with findings in the quickfix
" list (see compiler/nodal.vim).

if exists('b:did_ftplugin')
  finish
endif
let b:did_ftplugin = 1

setlocal comments=:# commentstring=#\ %s
setlocal expandtab shiftwidth=2 softtabstop=2
setlocal formatoptions-=t formatoptions+=croql
compiler nodal

let b:undo_ftplugin = 'setlocal comments< commentstring< expandtab< shiftwidth< softtabstop< formatoptions< makeprg< errorformat<'
