#!/usr/bin/env bash
# From a lamp file and a sample file to element calls through Emberline's HTTP API (the README's
# example; tests/integration/api-example.test.ts runs it against the test server).
# Usage: bash docs/api-example.sh [base URL]   (default http://127.0.0.1:3000, the app `npm start` serves)
set -euo pipefail
BASE=${1:-http://127.0.0.1:3000}
DEMO=$(cd "$(dirname "$0")/../db/demo" && pwd)
JAR=$(mktemp)
trap 'rm -f "$JAR"' EXIT
json() { node -pe "const v = JSON.parse(require('fs').readFileSync(0, 'utf8')); $1"; }
post() { curl -sf -b "$JAR" -c "$JAR" -H 'content-type: application/json' -d "$2" "$BASE$1"; }

# Sign in as the demo lab lead (a token works too: -H "Authorization: Bearer $TOKEN").
post /api/session '{"email":"lead@demo.emberline.example","password":"emberline-demo"}' >/dev/null
TEAM=$(curl -sf -b "$JAR" "$BASE/api/teams" | json 'v.find((t) => t.role === "lab_lead").id')

INSTRUMENT=$(post /api/instruments "{\"teamId\":\"$TEAM\",\"name\":\"Bench grating $(date +%s)\",\"dispersion\":\"grating\",\"pixels\":2048,\"nominalMinNm\":350,\"nominalMaxNm\":900,\"resolutionNm\":1}" | json v.id)
LAMP=$(curl -sf -b "$JAR" -F "file=@$DEMO/bench-grating-lamp-hg-ar.csv" -F "instrumentId=$INSTRUMENT" -F kind=lamp -F "label=Hg-Ar lamp" "$BASE/api/spectra" | json v.id)
CALIBRATION=$(post /api/calibrations "{\"instrumentId\":\"$INSTRUMENT\",\"spectrumId\":\"$LAMP\",\"lamps\":[\"Hg\",\"Ar\"]}" | json '`${v.id} ${v.model} RMS ${v.rmsNm.toFixed(4)} nm`')
echo "calibration: $CALIBRATION"
SAMPLE=$(curl -sf -b "$JAR" -F "file=@$DEMO/bench-grating-flame-sample.csv" -F "instrumentId=$INSTRUMENT" -F kind=sample -F "label=Flame sample" "$BASE/api/spectra" | json v.id)
NOTEBOOK=$(post /api/notebooks "{\"teamId\":\"$TEAM\",\"title\":\"API example\"}" | json v.id)
post /api/runs "{\"notebookId\":\"$NOTEBOOK\",\"spectrumId\":\"$SAMPLE\",\"calibrationId\":\"${CALIBRATION%% *}\",\"source\":\"flame\"}" |
  json 'v.calls.filter((c) => c.verdict !== "absent").map((c) => `${c.species}: ${c.verdict} (score ${c.score.toFixed(2)})`).join("\n")'
