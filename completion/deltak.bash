# bash completion for deltak: commands, each command's options, crystal
# names (ids and aliases, from `deltak crystals --names`), data-set names
# of the crystal on the line (`deltak crystals --names CRYSTAL`), and the
# fixed values of options such as --type or --solve.
#
# Installed as share/bash-completion/completions/deltak (loaded on
# demand by bash-completion); or source it from ~/.bashrc. It needs no
# other helper. Names containing spaces ("beta barium borate") are not
# offered; quote them by hand.

# Options of one command, from its --help (cached for the shell).
declare -gA _deltak_opts_cache 2>/dev/null || true

_deltak_prog() {
    local p=${COMP_WORDS[0]}
    [[ $p == */* ]] && { printf '%s\n' "$p"; return; }
    command -v "$p" 2>/dev/null || printf 'deltak\n'
}

_deltak_options() {
    local prog=$1 cmd=$2
    if [[ -z ${_deltak_opts_cache[$cmd]+set} ]]; then
        _deltak_opts_cache[$cmd]=$("$prog" "$cmd" --help 2>/dev/null |
            grep -o -- '--[a-z0-9][a-z0-9-]*' | sort -u | tr '\n' ' ')
    fi
    printf '%s\n' "${_deltak_opts_cache[$cmd]}"
}

# Words of the line up to the cursor, split at blanks only (bash's own
# COMP_WORDS also splits at ':' and '=', which crystal names such as
# MgO:LN and --vary period=... contain).
_deltak_words() {
    local line=${COMP_LINE:0:COMP_POINT}
    read -r -a _deltak_w <<<"$line"
    [[ $line == *[[:blank:]] || -z $line ]] && _deltak_w+=("")
}

# Offer the words of $2 (one a line) that start with $1, ignoring case
# (deltak matches crystal names case-insensitively).
_deltak_offer() {
    local cur=${1,,} w
    while IFS= read -r w; do
        [[ -n $w && $w != *[[:blank:]]* && ${w,,} == "$cur"* ]] &&
            COMPREPLY+=("$w")
    done <<<"$2"
}

_deltak_complete() {
    local _deltak_w
    _deltak_words
    local n=${#_deltak_w[@]}
    local cur=${_deltak_w[n-1]} prev=""
    (( n >= 2 )) && prev=${_deltak_w[n-2]}
    local prog cmd="" crystal="" i
    prog=$(_deltak_prog)
    COMPREPLY=()
    for ((i = 1; i < n - 1; i++)); do
        case ${_deltak_w[i]} in
        --crystal) crystal=${_deltak_w[i+1]} ;;
        --crystal=*) crystal=${_deltak_w[i]#--crystal=} ;;
        esac
    done
    # deltak <command> [options]: the command is the first word.
    (( n > 2 )) && [[ ${_deltak_w[1]} != -* ]] && cmd=${_deltak_w[1]}

    if [[ -z $cmd ]]; then
        if [[ $cur == -* ]]; then
            _deltak_offer "$cur" $'--help\n--version'
        else
            _deltak_offer "$cur" "$("$prog" --help 2>/dev/null |
                sed -n '/^commands:/,/^$/s/^  \([a-z][a-z-]*\) .*/\1/p')"
        fi
    else
        local opt=$prev value=$cur
        if [[ $cur == --*=* ]]; then
            opt=${cur%%=*}
            value=${cur#*=}
        elif [[ $cur == -* || $prev != -* ]]; then
            opt=""
        fi
        # A flag takes no value: after it come options again.
        case $opt in
        --json|--csv|--all-sets|--broadband|--magic|--ncpm|--depletion|\
        --spectrum|--check|--names|--help) opt="" ;;
        --curve) [[ $cmd != tolerance ]] && opt="" ;;
        esac
        case $opt in
        --crystal)
            if [[ $value == */* || $value == .* || $value == '~'* ]]; then
                _deltak_offer "$value" "$(compgen -f -- "$value")"
            else
                _deltak_offer "$value" "$("$prog" crystals --names 2>/dev/null)"
            fi ;;
        --dispersion)
            [[ -n $crystal ]] && _deltak_offer "$value" \
                "$("$prog" crystals --names "$crystal" 2>/dev/null)" ;;
        --type) _deltak_offer "$value" $'0\nI\nII' ;;
        --scheme) _deltak_offer "$value" $'qpm\nbirefringent' ;;
        --process) _deltak_offer "$value" $'shg\nsfg\ndfg\nopa\nopo' ;;
        --plane) _deltak_offer "$value" $'XY\nYZ\nXZ' ;;
        --log) _deltak_offer "$value" $'x\ny\nxy' ;;
        --size) _deltak_offer "$value" $'single\ndouble\nslide' ;;
        --legend)
            _deltak_offer "$value" $'auto\nnone\nupper-left\nupper-right\nlower-left\nlower-right\noutside' ;;
        --solve)
            _deltak_offer "$value" $'idler\nsignal\nwavelengths\nperiod\ntemp\ntheta\nphi\ngvm\ndeff\nsinc2\naccept-temp\naccept-signal\naccept-theta' ;;
        --vary|--map|--family)
            [[ $value != *=* ]] && _deltak_offer "$value" \
                $'period=\ntemp=\npump=\nsignal=\nidler=\nfundamental=\ntheta=\nphi=\nalpha=\nlength='
            compopt -o nospace 2>/dev/null ;;
        --curve)
            [[ $cmd == tolerance ]] && _deltak_offer "$value" \
                $'temperature\nsignal\npump\ntheta\nphi\nperiod\ntilt' ;;
        --plot|--report)
            _deltak_offer "$value" "$(compgen -f -- "$value")" ;;
        "")
            if [[ $cmd == crystals && $cur != -* ]]; then
                _deltak_offer "$cur" "$("$prog" crystals --names 2>/dev/null)"
            elif [[ $cmd == run && $cur != -* ]]; then
                _deltak_offer "$cur" "$(compgen -f -- "$cur")"
            else
                _deltak_offer "$cur" "$(_deltak_options "$prog" "$cmd" | tr ' ' '\n')"
            fi ;;
        esac
        # --name=value: offer whole words, as typed.
        if [[ $cur == --*=* ]]; then
            COMPREPLY=("${COMPREPLY[@]/#/$opt=}")
        fi
    fi

    # bash replaces only the part of the word after its last word-break
    # character (':' and '=' by default): drop what is already there.
    local breaks=${COMP_WORDBREAKS//[^:=]/}
    if [[ -n $breaks && $cur == *["$breaks"]* ]]; then
        local typed=${cur%"${cur##*["$breaks"]}"} k
        for k in "${!COMPREPLY[@]}"; do
            COMPREPLY[k]=${COMPREPLY[k]:${#typed}}
        done
    fi
}

complete -F _deltak_complete deltak
