import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, CanonicalJsonError } from './canonical-json';

describe('canonicalJson (RFC 8785)', () => {
  it('serialises the RFC 8785 §3.2.2 sample as the RFC prints it', () => {
    // Input and expected output of RFC 8785 §3.2.2 / §3.2.4 (quoted from memory of the RFC text).
    const input = JSON.parse(
      String.raw`{"numbers":[333333333.33333329,1E30,4.50,2e-3,0.000000000000000000000000001],"string":"\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/","literals":[null,true,false]}`,
    );
    expect(canonicalJson(input)).toBe(String.raw`{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\u000f\nA'B\"\\\\\"/"}`);
  });

  it('sorts members by UTF-16 code units, as in the RFC 8785 §3.2.3 example', () => {
    // RFC 8785 §3.2.3: the sorted order of these keys (quoted from memory of the RFC text).
    const input = JSON.parse(String.raw`{"\u20ac":"Euro Sign","\r":"Carriage Return","\ufb33":"Hebrew Letter Dalet With Dagesh","1":"One","\ud83d\ude00":"Emoji: Grinning Face","\u0080":"Control","\u00f6":"Latin Small Letter O With Diaeresis"}`);
    const keys = Object.keys(JSON.parse(canonicalJson(input)) as object);
    // JSON.parse puts the integer-like key "1" first in any object; read the order off the text instead.
    const order = ['\r', '1', '\u0080', '\u00f6', '\u20ac', '\ud83d\ude00', '\ufb33'].map((k) => canonicalJson(input).indexOf(JSON.stringify(k)));
    expect(order).toEqual([...order].sort((a, b) => a - b));
    expect(keys).toHaveLength(7);
  });

  it('leaves out undefined members, refuses NaN and writes Dates as ISO text', () => {
    expect(canonicalJson({ b: 1, a: undefined, c: [undefined, 2] })).toBe('{"b":1,"c":[null,2]}');
    expect(canonicalJson({ at: new Date('2026-11-18T09:00:00.000Z') })).toBe('{"at":"2026-11-18T09:00:00.000Z"}');
    expect(() => canonicalJson({ x: Number.NaN })).toThrow(CanonicalJsonError);
  });

  it('gives one digest for the same data whatever the member order', () => {
    const a = canonicalJson({ survey: { id: 'x', name: 'n' }, readings: [{ fieldT: 0.0012, id: 'r' }] });
    const b = canonicalJson({ readings: [{ id: 'r', fieldT: 0.0012 }], survey: { name: 'n', id: 'x' } });
    expect(a).toBe(b);
    const digest = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');
    expect(digest(a)).toBe(digest(b));
    // FIPS 180-4 / NIST CSRC example: SHA-256("abc") (a check that the digest is the standard one).
    expect(digest('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});
