// Natural order of file names: runs of decimal digits compare as numbers, so "frame2" comes
// before "frame10". Text compares case-insensitively by code unit (no locale), ties are broken
// by fewer leading zeros and then by plain code-unit order, so the order is total and stable
// across machines. A '-' is text: "H-5" sorts before "H-10" (numbers are unsigned here).

function isDigit(code: number): boolean {
  return code >= 48 && code <= 57;
}

/** Compares two names in natural order (negative: `a` first, 0: identical). */
export function naturalCompare(a: string, b: string): number {
  let i = 0;
  let j = 0;
  let tie = 0; // first difference in leading zeros, used only if all else is equal
  while (i < a.length && j < b.length) {
    const ca = a.charCodeAt(i);
    const cb = b.charCodeAt(j);
    if (isDigit(ca) && isDigit(cb)) {
      let ia = i;
      let jb = j;
      while (ia < a.length && a.charCodeAt(ia) === 48) ia++;
      while (jb < b.length && b.charCodeAt(jb) === 48) jb++;
      let ea = ia;
      let eb = jb;
      while (ea < a.length && isDigit(a.charCodeAt(ea))) ea++;
      while (eb < b.length && isDigit(b.charCodeAt(eb))) eb++;
      // Significant digits: a longer run is a larger number; equal lengths compare digit by digit.
      if (ea - ia !== eb - jb) return ea - ia - (eb - jb);
      for (let k = 0; k < ea - ia; k++) {
        const d = a.charCodeAt(ia + k) - b.charCodeAt(jb + k);
        if (d !== 0) return d;
      }
      if (tie === 0) tie = ia - i - (jb - j);
      i = ea;
      j = eb;
      continue;
    }
    const la = ca >= 65 && ca <= 90 ? ca + 32 : ca;
    const lb = cb >= 65 && cb <= 90 ? cb + 32 : cb;
    if (la !== lb) return la - lb;
    i++;
    j++;
  }
  const rest = a.length - i - (b.length - j);
  if (rest !== 0) return rest;
  if (tie !== 0) return tie;
  return a < b ? -1 : a > b ? 1 : 0;
}

/** A new array of the names in natural order. */
export function naturalSort(names: readonly string[]): string[] {
  return [...names].sort(naturalCompare);
}
