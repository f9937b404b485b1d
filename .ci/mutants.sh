#!/usr/bin/env bash
# Mutation check: applies each deliberate bug of .ci/mutants.txt, one at a
# time, to a copy of the tree and runs the non-golden tests (unit tests and
# tests/cli, without the byte comparisons of tests/cli/examples.rs and the
# saved-SVG comparison). A mutation that no test catches SURVIVES.
#
#   .ci/mutants.sh              every mutation (about 1-2 min each)
#   .ci/mutants.sh ID [ID...]   only these (ids as in .ci/mutants.txt)
#
# Prints one line per mutation (CAUGHT, SURVIVED, STALE when its text no
# longer matches the code) and a summary; exits 1 if any survived or is
# stale. The working tree is never touched: the copy lives in
# target/mutants-tree (laid anew each run) and builds in its own
# target/mutants (MUTANTS_TARGET_DIR overrides), never in target/: cargo
# names a workspace's artifacts independently of its path, so a shared
# target folder would hand mutated builds back to the working tree.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
LIST="$ROOT/.ci/mutants.txt"
export CARGO_TARGET_DIR="${MUTANTS_TARGET_DIR:-$ROOT/target/mutants}"
TIMEOUT_S="${MUTANTS_TIMEOUT_S:-1200}"
# A fixed path, so that cargo reuses the copy's own build between runs.
WORK="$ROOT/target/mutants-tree"
rm -rf "$WORK"
mkdir -p "$WORK"

# The tree as it is now: tracked and untracked files, not ignored ones.
(cd "$ROOT" && git ls-files -z --cached --others --exclude-standard \
    | xargs -0 -I{} sh -c 'test -e "{}" && printf "%s\0" "{}"' \
    | tar --null -T - -cf -) | (cd "$WORK" && tar -xf -)
# Fresh modification times: cargo decides what to rebuild by them.
find "$WORK" -type f -exec touch {} +

run_tests() {
    (cd "$WORK" && timeout "$TIMEOUT_S" cargo test --release --locked -q \
        --lib --test cli -- --skip examples:: --skip matches_saved_svg) \
        >"$WORK/.last-test.log" 2>&1
}

# mutate ID apply|list: apply the mutation to the copy (exit 3 if stale).
mutate() {
    python3 - "$LIST" "$WORK" "$1" "$2" <<'PY'
import pathlib, sys
path, work, want, mode = sys.argv[1:5]
muts, cur, side = [], None, None
for line in open(path, encoding="utf-8").read().split("\n"):
    if line == "@@@ old":
        cur["pairs"].append([[], []]); side = 0
    elif line == "@@@ new":
        side = 1
    elif line == "@@@ end":
        side = None
    elif side is not None:
        cur["pairs"][-1][side].append(line)
    elif line.startswith("## id: "):
        cur = {"id": line[7:].strip(), "file": None, "what": "", "pairs": []}
        muts.append(cur)
    elif cur is not None and line.startswith("## file: "):
        cur["file"] = line[9:].strip()
    elif cur is not None and line.startswith("## what: "):
        cur["what"] = line[9:].strip()
if mode == "list":
    for m in muts:
        print(f"{m['id']}\t{m['what']}")
    sys.exit(0)
m = next((m for m in muts if m["id"] == want), None)
if m is None:
    sys.exit(f"no mutation named {want!r} in {path}")
f = pathlib.Path(work) / m["file"]
text = f.read_text(encoding="utf-8") if f.exists() else ""
for old, new in m["pairs"]:
    old, new = "\n".join(old), "\n".join(new)
    if text.count(old) != 1:
        sys.exit(3)
    text = text.replace(old, new)
f.write_text(text, encoding="utf-8")
PY
}

mapfile -t ALL < <(mutate "" list | cut -f1)
IDS=("$@")
[ ${#IDS[@]} -eq 0 ] && IDS=("${ALL[@]}")

echo "mutants: baseline (no mutation) ..."
if ! run_tests; then
    tail -30 "$WORK/.last-test.log"
    echo "mutants: the unmutated tree fails its tests; fix that first" >&2
    exit 2
fi

caught=0 survived=0 stale=0
SURVIVORS=()
for id in "${IDS[@]}"; do
    what=$(mutate "" list | awk -F'\t' -v id="$id" '$1 == id {print $2}')
    file=$(awk -v id="$id" '$0 == "## id: " id {f = 1; next} f && /^## file: / {print substr($0, 10); exit}' "$LIST")
    if [ -z "$file" ]; then
        echo "mutants: unknown id $id" >&2
        exit 2
    fi
    cp "$ROOT/$file" "$WORK/$file" 2>/dev/null || true
    set +e
    mutate "$id" apply
    status=$?
    set -e
    if [ $status -eq 3 ]; then
        printf '%-28s STALE     %s\n' "$id" "$what"
        stale=$((stale + 1))
        SURVIVORS+=("$id (stale)")
        continue
    elif [ $status -ne 0 ]; then
        exit 2
    fi
    start=$(date +%s)
    if run_tests; then
        result=SURVIVED
        survived=$((survived + 1))
        SURVIVORS+=("$id")
    else
        result=CAUGHT
        caught=$((caught + 1))
        failing=$(grep -E '^    [a-z0-9_:]+$' "$WORK/.last-test.log" | sed 's/^ *//' | sort -u | head -3 | paste -sd, - || true)
        [ -n "$failing" ] && what="$what [by: $failing]"
    fi
    printf '%-28s %-9s %s (%ss)\n' "$id" "$result" "$what" "$(( $(date +%s) - start ))"
    cp "$ROOT/$file" "$WORK/$file"
done

echo "mutants: $caught caught, $survived survived, $stale stale"
if [ ${#SURVIVORS[@]} -gt 0 ]; then
    echo "mutants: not caught: ${SURVIVORS[*]}"
    exit 1
fi
