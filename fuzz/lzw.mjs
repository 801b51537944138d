/** Unix compress (.Z) encoder, compress 4.0 style (LZW, 9-16 bit codes, block mode), for making fuzz seeds. */
export function lzwEncode(data, maxBits = 16, block = true, clearWhenFull = false) {
  const out = [0x1f, 0x9d, maxBits | (block ? 0x80 : 0)];
  let acc = 0;
  let accBits = 0;
  let codesInGroup = 0;
  let nBits = 9;
  let maxCode = 511;
  const maxMax = 1 << maxBits;
  let freeEnt = block ? 257 : 256;
  let clearFlag = false;
  const dict = new Map();
  const put = (code, bits) => {
    acc |= code << accBits;
    accBits += bits;
    while (accBits >= 8) {
      out.push(acc & 0xff);
      acc >>>= 8;
      accBits -= 8;
    }
  };
  const output = (code) => {
    put(code, nBits);
    codesInGroup = (codesInGroup + 1) & 7;
    if (freeEnt > maxCode || clearFlag) {
      // pad the rest of the group with zero bits, byte aligned
      let pad = codesInGroup === 0 ? 0 : (8 - codesInGroup) * nBits;
      while (pad > 0) {
        const b = Math.min(pad, 8);
        put(0, b);
        pad -= b;
      }
      codesInGroup = 0;
      if (clearFlag) {
        nBits = 9;
        maxCode = 511;
        clearFlag = false;
      } else {
        nBits++;
        maxCode = nBits === maxBits ? maxMax : (1 << nBits) - 1;
      }
    }
  };
  if (data.length > 0) {
    let ent = data[0];
    for (let i = 1; i < data.length; i++) {
      const c = data[i];
      const key = ent * 256 + c;
      const hit = dict.get(key);
      if (hit !== undefined) {
        ent = hit;
        continue;
      }
      output(ent);
      ent = c;
      if (freeEnt < maxMax) dict.set(key, freeEnt++);
      else if (block && clearWhenFull) {
        dict.clear();
        freeEnt = 257;
        clearFlag = true;
        output(256);
      }
    }
    output(ent);
  }
  if (accBits > 0) out.push(acc & 0xff);
  return new Uint8Array(out);
}
