#!/bin/sh
# check_real_recordings.sh: `framewise-cli features` on real recordings nobody here made,
# against an independent numpy/scipy computation (features_numpy.py, stages written from
# issue 2's formulas in make_reference.py), within issue 2's tolerances (1e-3 dB in dB
# domains, 1e-4 relative elsewhere) widened only by the float32 rounding bound.
#
# The recordings come from Debian data packages (sound themes, not audio programs):
#   deepin-sound-theme       /usr/share/sounds/deepin/stereo/*.wav  (16- and 24-bit PCM WAV)
#   sound-theme-freedesktop  /usr/share/sounds/freedesktop/stereo/*.oga  (Ogg Vorbis)
# Install them with: apt-get install -y deepin-sound-theme sound-theme-freedesktop
#
# Output is TAP (one line per clip, parameter set and stage; the worst deviations in each
# line). Skipped (TAP "1..0 # SKIP") when framewise-cli, /usr/bin/python3 with numpy/scipy or
# fewer than two of the recordings are missing.
#
# Environment: FW_CLI (path of framewise-cli; meson sets it), FW_SOURCE_DIR (repository root).
set -u

here=$(cd "$(dirname "$0")" && pwd)
cli=${FW_CLI:-}
py=/usr/bin/python3

skip () {
  echo "1..0 # SKIP $*"
  exit 0
}

if [ -z "$cli" ] || [ ! -x "$cli" ]; then
  skip "framewise-cli not found (set FW_CLI)"
fi
[ -x "$py" ] || skip "$py not found (Debian python3 with python3-numpy and python3-scipy)"
"$py" -c 'import numpy, scipy.fft, scipy.signal' 2>/dev/null ||
  skip "$py lacks numpy/scipy (apt-get install python3-numpy python3-scipy)"

clips=""
n_clips=0
for f in \
  /usr/share/sounds/deepin/stereo/camera-shutter.wav \
  /usr/share/sounds/deepin/stereo/system-shutdown.wav \
  /usr/share/sounds/freedesktop/stereo/bell.oga
do
  if [ -r "$f" ]; then
    clips="$clips $f"
    n_clips=$((n_clips + 1))
  else
    echo "# not found: $f"
  fi
done
[ "$n_clips" -ge 2 ] ||
  skip "fewer than two real recordings found (apt-get install deepin-sound-theme sound-theme-freedesktop)"

tmp=$(mktemp -d "${TMPDIR:-/tmp}/fw-real-recordings.XXXXXX") || exit 1
trap 'rm -rf "$tmp"' EXIT INT TERM

# Parameter sets: issue 2's defaults at the file's rate, and one that turns most conventions
# the other way (symmetric Hamming inside a longer FFT, magnitude, HTK unit-peak bands from
# 64 Hz, pre-emphasis, unnormalised DCT with lifter, dB re the clip's maximum with an 80 dB
# range, first channel only).
set_defaults="--set sample_rate=0"
set_other="--set sample_rate=0 --set channel=1 --set window_length=1024 --set hop_length=256 \
--set fft_length=1536 --set window=hamming --set window_symmetry=symmetric \
--set spectrum=magnitude --set mel_bands=40 --set mel_scale=htk --set mel_weights=unit \
--set fmin=64 --set pre_emphasis=0.97 --set dct_norm=none --set lifter=22 \
--set db_reference=max --set dynamic_range=80"

jobs="$tmp/jobs.tsv"
: >"$jobs"
n_expected=0
for clip in $clips; do
  for label in defaults other; do
    if [ "$label" = defaults ]; then
      settings=$set_defaults
      spectrum=power
    else
      settings=$set_other
      spectrum=magnitude
    fi
    stages="$spectrum db mel mel-db mfcc"
    dir="$tmp/$(basename "$clip")-$label"
    mkdir -p "$dir"
    for stage in $stages; do
      # shellcheck disable=SC2086 # settings are split on purpose
      if ! "$cli" features "$clip" "$stage" $settings -o "$dir/$stage.npy" \
          >"$dir/$stage.log" 2>&1; then
        echo "# framewise-cli features $clip $stage failed:"
        sed 's/^/#   /' "$dir/$stage.log"
      fi
      n_expected=$((n_expected + 1))
    done
    # one line per job: clip, directory, label, stages, settings (KEY=VALUE, space-separated)
    # shellcheck disable=SC2086
    printf '%s\t%s\t%s\t%s\t%s\n' "$clip" "$dir" "$label" "$(echo $stages | tr ' ' ',')" \
      "$(echo $settings | sed 's/--set //g')" >>"$jobs"
  done
done

# one numpy process for every job (numpy/scipy start-up dominates otherwise)
"$py" "$here/features_numpy.py" compare-jobs "$jobs" >"$tmp/compare.tap" 2>"$tmp/compare.err"
status=$?
if [ "$status" -eq 77 ]; then
  skip "features_numpy.py cannot run: $(cat "$tmp/compare.err")"
fi
sed 's/^/# /' "$tmp/compare.err"
cat "$tmp/compare.tap"
n=$(grep -c '^\(not \)\{0,1\}ok' "$tmp/compare.tap")
failed=$(grep -c '^not ok' "$tmp/compare.tap")
if [ "$n" -ne "$n_expected" ]; then
  n=$((n + 1))
  failed=$((failed + 1))
  echo "not ok - features_numpy.py reported $((n - 1)) of $n_expected stages (exit status $status)"
fi
echo "1..$n"
[ "$failed" -eq 0 ]
