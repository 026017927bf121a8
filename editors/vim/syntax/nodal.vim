" Vim syntax file for the nodal circuit language (*.nodal).
" Part of the nodal repository: editors/vim. See docs/editors.md.

if exists('b:current_syntax')
  finish
endif

let s:cpo_save = &cpo
set cpo&vim

syntax case match
" Names are letters, digits and _; units may carry µ, μ, Ω or Ω.
syntax iskeyword @,48-57,_,192-255,181

" Comments, and the accept directive inside them.
syntax match nodalComment "#.*$" contains=nodalAccept,nodalTodo,@Spell
syntax match nodalAccept "#\s*\zsnodal:\s*accept\>" contained
syntax keyword nodalTodo TODO FIXME XXX contained

syntax region nodalString start=+"+ end=+"+ end=+$+ oneline contains=@NoSpell

" Statements.
syntax keyword nodalKeyword design ground port include block ambient
" Built-in part kinds where a statement starts; any other first word
" followed by a name is a block instance.
syntax match nodalInstance "^\s*\zs\h\w*\ze\s\+\S\+\s*("
syntax match nodalKind "^\s*\zs\%(resistor\|capacitor\|inductor\|source\|diode\|led\|fuse\|switch\|wire\|battery\|load\|regulator\|converter\)\>"
" Attributes and switch states.
syntax keyword nodalAttribute tol rated vf at ideality series dcr capacity tempco derate theta tjmax breakdown dropout quiescent limit efficiency input
syntax keyword nodalState open closed

" Quantities: a number with anything glued to it (4.7kΩ, 4k7, 100nF, 5%),
" a unit standing alone after it, and resistor codes (R47).
syntax match nodalNumber "\<\d[0-9.]*\%([eE][+-]\=\d\+\)\=\%(\k\|%\)*"
syntax match nodalNumber "\%(^\|[^[:alnum:]_]\)\zs\.\d\+\%(\k\|%\)*"
syntax match nodalUnit "\<[pnuµμmkMGT]\=\%(Ω\|Ω\|ohm\|F\|H\|V\|Ah\|A\|W\)\>"
syntax match nodalUnit "\s\zs%"
" Temperatures and thermal quantities: °C (degC), K/W, ppm/K.
syntax match nodalUnit "°C\|\<degC\>\|\<K/W\>\|\<ppm/K\>"
" A code after the pins or parameters; elsewhere R1 is a name.
syntax match nodalCode "\%(\%()\|]\)\s*\)\@<=R\d\+\>"
" meg is not a prefix here: M is mega, m is milli.
syntax match nodalError "\c\<\d[0-9.]*meg\k*"
syntax match nodalError "\c\%(\d\s\+\)\@<=meg\k*"

syntax match nodalOperator "[-+*/=]"
syntax match nodalDelimiter "[()[\],{}]"

highlight default link nodalComment Comment
highlight default link nodalAccept SpecialComment
highlight default link nodalTodo Todo
highlight default link nodalString String
highlight default link nodalKeyword Keyword
highlight default link nodalKind Type
highlight default link nodalInstance Function
highlight default link nodalAttribute Identifier
highlight default link nodalState Constant
highlight default link nodalNumber Number
highlight default link nodalUnit Number
highlight default link nodalCode Number
highlight default link nodalError Error
highlight default link nodalOperator Operator
highlight default link nodalDelimiter Delimiter

let b:current_syntax = 'nodal'

let &cpo = s:cpo_save
unlet s:cpo_save
