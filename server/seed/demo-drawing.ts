/**
 * The demo project's truss T1 as a drafter would send it: a 12 m pitched roof truss with a
 * 3 m rise and six 2 m bottom panels, drawn in millimetres (R12 ASCII DXF). The bottom chord is
 * one long line through the panel points and the title sits on its own layer, so the import
 * report has something to say. Invented demo geometry.
 */
export function demoTrussDxf(): string {
  const lines: [number, number, number, number, string][] = [];
  const span = 12000;
  const rise = 3000;
  const panel = 2000;
  const top = (x: number) => (x <= span / 2 ? (rise * x) / (span / 2) : (rise * (span - x)) / (span / 2));
  // Bottom chord drawn as one line through all panel points.
  lines.push([0, 0, span, 0, 'CHORDS']);
  // Top chord: one line per rafter.
  lines.push([0, 0, span / 2, rise, 'CHORDS']);
  lines.push([span / 2, rise, span, 0, 'CHORDS']);
  // Verticals and diagonals (Howe web: diagonals slope down toward the supports' panels).
  for (let i = 1; i < 6; i++) lines.push([i * panel, 0, i * panel, top(i * panel), 'WEBS']);
  lines.push([2000, top(2000), 4000, 0, 'WEBS']);
  lines.push([4000, top(4000), 6000, 0, 'WEBS']);
  lines.push([6000, 0, 8000, top(8000), 'WEBS']);
  lines.push([8000, 0, 10000, top(10000), 'WEBS']);

  const out: (string | number)[] = [
    0, 'SECTION', 2, 'HEADER', 9, '$ACADVER', 1, 'AC1009', 9, '$INSUNITS', 70, 4, 0, 'ENDSEC',
    0, 'SECTION', 2, 'TABLES', 0, 'TABLE', 2, 'LAYER', 70, 4,
  ];
  for (const layer of ['0', 'CHORDS', 'WEBS', 'NOTES']) out.push(0, 'LAYER', 2, layer, 70, 0, 62, 7, 6, 'CONTINUOUS');
  out.push(0, 'ENDTAB', 0, 'ENDSEC', 0, 'SECTION', 2, 'ENTITIES');
  for (const [x1, y1, x2, y2, layer] of lines) out.push(0, 'LINE', 8, layer, 10, x1, 20, y1, 30, 0, 11, x2, 21, y2, 31, 0);
  out.push(0, 'TEXT', 8, 'NOTES', 10, 0, 20, -900, 30, 0, 40, 250, 1, 'T1 TYPICAL INTERIOR TRUSS - KESTREL LOGISTICS');
  out.push(0, 'CIRCLE', 8, 'NOTES', 10, span / 2, 20, rise + 600, 30, 0, 40, 300);
  out.push(0, 'ENDSEC', 0, 'EOF');
  return out.join('\n') + '\n';
}
