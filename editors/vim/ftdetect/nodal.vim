" nodal circuit descriptions: files ending in .nodal.
autocmd BufNewFile,BufRead *.nodal setfiletype nodal
