/** A bench script's whole upload in one command; `<` makes curl send the JSON file's text as the field value. */
export function curlExample(origin: string, token: string) {
  return [
    `curl -sS --fail-with-body \\`,
    `  -H "Authorization: Bearer ${token}" \\`,
    `  -F "metadata=<metadata.json" \\`,
    `  -F "file=@ha_aoi0.csv" \\`,
    `  -F "file=@ha_aoi12.csv" \\`,
    `  ${origin}/api/submissions`,
  ].join('\n');
}

export const METADATA_EXAMPLE = `{
  "label": "Example Hα 3 nm 36 mm",
  "lines": ["Ha"],
  "nominalCwlNm": 656.3,
  "nominalFwhmNm": 3,
  "licence": "CC-BY-4.0",
  "method": { "instrument": "spectrophotometer", "resolutionNm": 0.1,
              "beam": "collimated", "aoiDeg": 0 },
  "files": [ { "name": "ha_aoi0.csv", "aoiDeg": 0 },
             { "name": "ha_aoi12.csv", "aoiDeg": 12 } ]
}`;
