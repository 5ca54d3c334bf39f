#!/usr/bin/env bash
# Renders the on-screen piano's samples into public/samples/ from Debian's fluid-soundfont-gm
# (FluidR3_GM, MIT licence). Every third key from A0 to C8: Tone.Sampler repitches by at most
# a semitone and a half, which is inaudible on piano, and 30 notes keep the download near 1 MB.
# Needs: fluidsynth, sox (with Ogg Vorbis), fluid-soundfont-gm. Run: bash scripts/render-samples.sh
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
OUT="$ROOT/public/samples"
# The GM bank by its own name: default-GM.sf2 is an alternative that may point at TimGM6mb (GPL).
SF2="${SF2:-/usr/share/sounds/sf2/FluidR3_GM.sf2}"
LOW=21       # A0
HIGH=108     # C8
STEP=3
HOLD_TICKS=2880   # 3 s at the file's default 120 bpm and 480 ticks per beat
VELOCITY=96       # one layer at forte-ish; Tone scales loudness by the played velocity
LENGTH_S=3.6      # kept per note, including the fade
FADE_S=0.6
PEAK_DB=-1        # the loudest sample's peak after the shared gain

for tool in fluidsynth sox; do
  command -v "$tool" >/dev/null || { echo "missing $tool (apt-get install fluidsynth sox)" >&2; exit 1; }
done
[ -f "$SF2" ] || { echo "missing $SF2 (apt-get install fluid-soundfont-gm)" >&2; exit 1; }

WORK="$(mktemp -d)"
trap 'rm -rf "$WORK"' EXIT
mkdir -p "$OUT"

NAMES=(C Cs D Ds E F Fs G Gs A As B)
sample_name() { echo "${NAMES[$(($1 % 12))]}$(($1 / 12 - 1))"; }

# A one-note Standard MIDI File, format 0, written byte by byte:
# program 0 (acoustic grand), note on at 0, note off after HOLD_TICKS, end of track.
write_midi() {
  local note hex vlq
  note=$(printf '%02x' "$1")
  vlq=$(printf '%02x%02x' $(( (HOLD_TICKS >> 7) | 0x80 )) $(( HOLD_TICKS & 0x7f )))
  hex="4d546864000000060000000101e0"
  hex+="4d54726b00000010"
  hex+="00c000"
  hex+="0090${note}$(printf '%02x' "$VELOCITY")"
  hex+="${vlq}80${note}00"
  hex+="00ff2f00"
  # shellcheck disable=SC2059 # the format string is the data: \xNN escapes built from hex
  printf "$(sed 's/../\\x&/g' <<<"$hex")" >"$2"
}

# Pass 1: render each note dry (no reverb or chorus, so the sampler's output stays clean),
# mono, with the leading silence trimmed so a key sounds the moment it is pressed.
for ((midi = LOW; midi <= HIGH; midi += STEP)); do
  name=$(sample_name "$midi")
  write_midi "$midi" "$WORK/$name.mid"
  fluidsynth -ni -q -R 0 -C 0 -g 0.8 -r 44100 -F "$WORK/$name.wav" -T wav "$SF2" "$WORK/$name.mid" >/dev/null
  sox "$WORK/$name.wav" -c 1 "$WORK/$name.mono.wav" silence 1 0.002 -55d trim 0 "$LENGTH_S" fade t 0 "$LENGTH_S" "$FADE_S"
done

# Pass 2: one gain for all notes, so the keyboard keeps the piano's own balance between
# registers instead of every note peaking at the same level.
loudest=$(for f in "$WORK"/*.mono.wav; do sox "$f" -n stats 2>&1 | awk '/^Pk lev dB/ { print $4 }'; done | sort -g | tail -1)
gain=$(awk -v p="$loudest" -v t="$PEAK_DB" 'BEGIN { printf "%.2f", t - p }')
rm -f "$OUT"/*.ogg
for f in "$WORK"/*.mono.wav; do
  name=$(basename "$f" .mono.wav)
  sox "$f" -C 4 "$OUT/$name.ogg" gain "$gain"
done

echo "rendered $(ls "$OUT"/*.ogg | wc -l) samples, gain ${gain} dB, $(du -ch "$OUT"/*.ogg | tail -1 | cut -f1) in $OUT"
