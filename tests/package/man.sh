#!/bin/sh
# The man page covers the program: every command of `deltak --help`,
# every option of every command's --help, every option in the option
# tables of src/cli/, and its examples run (in a scratch folder).
#   sh tests/package/man.sh DELTAK MANFILE
DK=$(cd "$(dirname "$1")" && pwd)/$(basename "$1"); MANFILE=$2
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
status=0
MANWIDTH=200 man -l "$MANFILE" 2>/dev/null | sed 's/‐/-/g' >"$tmp/man.txt"
[ -s "$tmp/man.txt" ] || { echo "cannot render $MANFILE"; exit 1; }

has_option() { grep -Eq -- "$1([^a-z0-9-]|\$)" "$tmp/man.txt"; }

cmds=$("$DK" --help | sed -n '/^commands:/,/^$/s/^  \([a-z][a-z-]*\) .*/\1/p')
[ -n "$cmds" ] || { echo "no commands in deltak --help"; exit 1; }
sed -n '/^COMMANDS/,/^OPTIONS/p' "$tmp/man.txt" >"$tmp/commands.txt"
for c in $cmds; do
    grep -Eq "^ +$c( |\$)" "$tmp/commands.txt" || { echo "command '$c' is not in COMMANDS"; status=1; }
    for o in $("$DK" "$c" --help | grep -o -- '--[a-z0-9][a-z0-9-]*' | sort -u); do
        has_option "$o" || { echo "option $o of '$c' is not in the man page"; status=1; }
    done
done
for o in $(grep -ho '{"[a-z0-9-]*", *[a-z]*_argument' src/cli/*.c src/cli/*.h |
           sed 's/{"\([a-z0-9-]*\)".*/\1/' | sort -u); do
    has_option "--$o" || { echo "option --$o (src/cli) is not in the man page"; status=1; }
done
for v in DELTAK_CRYSTALS "EXIT STATUS" "LASER SAFETY" 1064nm 9398cm-1 281.8THz; do
    grep -q -- "$v" "$tmp/man.txt" || { echo "'$v' is not in the man page"; status=1; }
done

# The examples, as written in the page, run and answer (exit 0).
sed -n '/^\.SH EXAMPLES/,/^\.SH LASER/p' "$MANFILE" |
    sed -e 's/\\-/-/g' -e 's/\\(\*m/µ/g' |
    awk '/^deltak / { cmd = $0; while (cmd ~ /\\e$/) { sub(/ *\\e$/, "", cmd); getline nxt; sub(/^ +/, " ", nxt); cmd = cmd nxt } print cmd }' \
    >"$tmp/examples"
[ "$(wc -l <"$tmp/examples")" -ge 8 ] || { echo "too few examples found"; status=1; }
while IFS= read -r line; do
    set -- $line; shift
    (cd "$tmp" && "$DK" "$@" >/dev/null 2>"$tmp/err") ||
        { echo "example failed: $line"; sed 's/^/    /' "$tmp/err" | head -5; status=1; }
done <"$tmp/examples"
exit $status
