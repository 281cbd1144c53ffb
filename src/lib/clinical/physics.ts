// Physics facts of the trade (CLINICAL.md §7, common practice). Units in every name.

/** Speed of sound assumed by scanners for soft tissue: 1540 m/s (= 1.54 mm/µs). */
export const SPEED_OF_SOUND_SOFT_TISSUE_M_S = 1540;

/** Lowest ultrasound frequency: sound above the audible 20 Hz–20 kHz range. */
export const ULTRASOUND_MIN_FREQUENCY_HZ = 20_000;

/** Range equation, depth = c·t/2, e.g. `depthCmFromRoundTripUs(130) ≈ 10.01`. */
export function depthCmFromRoundTripUs(roundTripUs: number, speedMS = SPEED_OF_SOUND_SOFT_TISSUE_M_S): number {
  const depthM = (speedMS * roundTripUs * 1e-6) / 2;
  return depthM * 100;
}

/** Round-trip time for one cm of depth, e.g. `roundTripUsPerCm() ≈ 12.99`. */
export function roundTripUsPerCm(speedMS = SPEED_OF_SOUND_SOFT_TISSUE_M_S): number {
  return ((2 * 0.01) / speedMS) * 1e6;
}

/** Wavelength λ = c/f, e.g. `wavelengthMm(5) === 0.308`. */
export function wavelengthMm(frequencyMHz: number, speedMS = SPEED_OF_SOUND_SOFT_TISSUE_M_S): number {
  return (speedMS / (frequencyMHz * 1e6)) * 1000;
}

/**
 * Near-field (Fresnel zone) length of an unfocused disc, NZL = D²/(4λ), e.g.
 * `nearFieldLengthMm(10, 5) ≈ 81.2`. Texts also use L²/λ or D²/2λ; we fix D²/(4λ) (CLINICAL.md §7).
 */
export function nearFieldLengthMm(apertureDiameterMm: number, frequencyMHz: number, speedMS = SPEED_OF_SOUND_SOFT_TISSUE_M_S): number {
  return apertureDiameterMm ** 2 / (4 * wavelengthMm(frequencyMHz, speedMS));
}
