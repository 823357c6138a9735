#!/usr/bin/env bash
# Copies every example, template and bad-input fragment into fuzz/corpus/load_text, and writes
# fuzz/site.dict (the schema's keys and the unit spellings) for libFuzzer's -dict option.
set -euo pipefail
cd "$(dirname "$0")/.."
mkdir -p fuzz/corpus/load_text
cp site-examples/*.yaml fuzz/corpus/load_text/
for t in district-heating borefield water-main; do cargo run -q -- init "$t" > "fuzz/corpus/load_text/template-$t.yaml"; done
python3 - <<'PY'
import json, re
schema = json.load(open("schemas/site.schema.json"))
keys = set()
def walk(v):
    if isinstance(v, dict):
        for k, x in v.get("properties", {}).items():
            keys.add(k)
        for x in v.values():
            walk(x)
    elif isinstance(v, list):
        for x in v:
            walk(x)
walk(schema)
units = ["mm", "m", "W/(m K)", "MJ/(m3 K)", "°C", "°F", "K", "kWh", "MWh", "kW", "l/s", "h", "d", "years", "%", "°C·d", "m2 K/W", "m K/W"]
with open("fuzz/site.dict", "w") as f:
    for k in sorted(keys):
        f.write(f'"{k}: "\n')
    for u in units:
        f.write('"%s"\n' % u.replace('"', '\\"'))
    for s in ["&a ", "*a", "[", "]", "{", "}", "\\x0d", "\\x00", "---", "1e308", "((((" ]:
        f.write(f'"{s}"\n')
PY
echo "seeds in fuzz/corpus/load_text, dictionary in fuzz/site.dict"
