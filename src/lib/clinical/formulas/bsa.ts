export type BsaMethod = 'mosteller' | 'dubois';

/** Mosteller, NEJM 1987: √(height·weight/3600), e.g. `bsaMostellerM2(170, 70) ≈ 1.8181`. */
export function bsaMostellerM2(heightCm: number, weightKg: number): number {
  return Math.sqrt((heightCm * weightKg) / 3600);
}

/** DuBois & DuBois 1916: 0.007184·H^0.725·W^0.425, e.g. `bsaDuBoisM2(170, 70) ≈ 1.8097`. */
export function bsaDuBoisM2(heightCm: number, weightKg: number): number {
  return 0.007184 * heightCm ** 0.725 * weightKg ** 0.425;
}

export const BSA_METHOD_LABELS: Readonly<Record<BsaMethod, string>> = {
  mosteller: 'Mosteller',
  dubois: 'DuBois',
};

/** BSA by the named method, e.g. `bsaM2(170, 70, 'dubois') ≈ 1.8097`. */
export function bsaM2(heightCm: number, weightKg: number, method: BsaMethod = 'mosteller'): number {
  return method === 'dubois' ? bsaDuBoisM2(heightCm, weightKg) : bsaMostellerM2(heightCm, weightKg);
}

/** Index a value to BSA (LVMI, LAVI, LVIDd/BSA), e.g. `indexToBsa(181.976, 1.8181) ≈ 100.09`. */
export function indexToBsa(value: number, bsaValueM2: number): number {
  return value / bsaValueM2;
}
