#!/usr/bin/env bash
# Re-renders the sample weigh-report from the invented demo session:
#   reports/sample/weigh-report-sample.pdf (+ .sig), its first page as PNG, and the demo
#   station's public key. The private key is made in a temporary folder and thrown away.
# Usage: reports/sample/make-sample.sh [path/to/scaleproof]
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
bin="${1:-$here/../../build/scaleproof}"
session="$here/../../data-demo/sessions/01-pickup-travel-trailer.json"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
"$bin" key new --out "$tmp/demo-station" >/dev/null
rm -f "$here/weigh-report-sample.pdf" "$here/weigh-report-sample.pdf.sig"
"$bin" report "$session" --key "$tmp/demo-station.key" --out "$here/weigh-report-sample.pdf" \
    --signed-by "Marit Oyelaran" --issued-at 2026-10-14T10:05:00-06:00
cp "$tmp/demo-station.pub.pem" "$here/demo-station.pub.pem"
pdftoppm -r 80 -png -f 1 -l 1 -singlefile "$here/weigh-report-sample.pdf" "$here/weigh-report-sample-page1" 2>/dev/null
"$bin" verify "$here/weigh-report-sample.pdf" --pubkey "$here/demo-station.pub.pem"
