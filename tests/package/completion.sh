#!/bin/sh
# Bash completion: source the file in bash and call its function as bash
# would, for commands, options per command, crystal and data-set names
# (with the ':' bash splits words at), fixed values and crystal files.
#   sh tests/package/completion.sh COMPLETION-FILE DELTAK
exec bash -c '
source "$1" || exit 1
DK=$2 status=0
t() {
    want=$1; COMP_LINE=$2; COMP_POINT=${#COMP_LINE}
    read -r -a COMP_WORDS <<<"$COMP_LINE"
    [[ $COMP_LINE == *" " ]] && COMP_WORDS+=("")
    COMP_CWORD=$((${#COMP_WORDS[@]} - 1)); COMP_WORDS[0]=$DK
    COMPREPLY=()
    _deltak_complete
    got="${COMPREPLY[*]}"
    if [[ " $got " != *" $want "* ]]; then
        echo "not ok: [$COMP_LINE] offers [$got], not [$want]"; status=1
    fi
}
none() {
    COMP_LINE=$1; COMP_POINT=${#COMP_LINE}
    read -r -a COMP_WORDS <<<"$COMP_LINE"; COMP_CWORD=$((${#COMP_WORDS[@]} - 1))
    COMP_WORDS[0]=$DK; COMPREPLY=(); _deltak_complete
    [[ ${#COMPREPLY[@]} -eq 0 ]] || { echo "not ok: [$1] offers [${COMPREPLY[*]}]"; status=1; }
}
complete -p deltak >/dev/null || { echo "not ok: no completion registered"; status=1; }
t period "deltak per"
t tolerance "deltak "
t --version "deltak --ver"
t --wavelength "deltak index --wav"
t --idler-range "deltak chip --idler"
t --report "deltak run x.dk --rep"
t --names "deltak crystals --na"
t BBO "deltak index --crystal BB"
t BBO "deltak index --crystal bb"
t LN "deltak index --crystal MgO:L"
t MgO:LiNbO3 "deltak index --crystal MgO"
t Gayer2008 "deltak period --crystal MgO:LN --dispersion Ga"
t Tamosauskas2018 "deltak angle --crystal=BBO --dispersion T"
t II "deltak angle --crystal BBO --type I"
t accept-temp "deltak sweep --crystal BBO --solve accept-t"
t period= "deltak sweep --crystal MgO:LN --vary per"
t temperature "deltak tolerance --crystal BBO --curve temp"
t --ncpm "deltak angle --crystal LBO --curve --nc"
t PPKTP "deltak crystals PPK"
t crystals/bbo.yaml "deltak index --crystal crystals/bb"
t BBO "deltak index --crystal=BB"
none "deltak index --temp 4"
none "deltak index --crystal unobtainium"
exit $status
' completion-test "$1" "$2"
