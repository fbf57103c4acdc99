import { describe, expect, it } from 'vitest';
import { LAYER_INKS, layerColour, layerColours, layerNameHash } from './layer-colours';

describe('layer colours', () => {
  it('hashes with FNV-1a 32 as its published test vectors give ("" → 811c9dc5, "a" → e40c292c, "foobar" → bf9cf968; from memory)', () => {
    expect(layerNameHash('')).toBe(0x811c9dc5);
    expect(layerNameHash('a')).toBe(0xe40c292c);
    expect(layerNameHash('foobar')).toBe(0xbf9cf968);
  });

  it('when a later drawing version lists its layers in another order or adds layers, then each layer keeps its ink', () => {
    const v1 = layerColours(['CHORDS', 'WEBS']);
    const v2 = layerColours(['DIMENSIONS', 'WEBS', 'TAGS', 'CHORDS']);
    expect(v2.get('CHORDS')).toBe(v1.get('CHORDS'));
    expect(v2.get('WEBS')).toBe(v1.get('WEBS'));
    expect(v1.get('CHORDS')).toBe(LAYER_INKS[layerNameHash('CHORDS') % LAYER_INKS.length]);
  });

  it('gives every ink of the palette to some name, never a colour outside it', () => {
    const seen = new Set(Array.from({ length: 200 }, (_, i) => layerColour(`L${i}`)));
    expect([...seen].sort()).toEqual([...LAYER_INKS].sort());
  });
});
