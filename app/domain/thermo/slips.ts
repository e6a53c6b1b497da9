/**
 * Slips: the mistakes a student can make, re-applied inside the computation so the solver can
 * tell which one reproduces a wrong answer (catalogue and feedback in
 * app/domain/grading/pitfalls.ts). Each flag changes the SAME variant in one place:
 * - celsiusForKelvin: a temperature typed in °C is used numerically as kelvin (27 °C → 27 K)
 * - cpCvSwapped: cp and cv trade places in every heat/energy/entropy formula
 * - gammaSwapped: a monatomic gas gets the diatomic γ (cv = 5/2 R), or the reverse
 * - kiloFactor: 'input-kJ-as-J' reads every given in kJ as J; 'times-1000' / 'divided-by-1000'
 *   scale the answer (the kJ/J factor on the way out)
 * - log10ForLn: log10 wherever a logarithm is taken by hand (isothermal work, entropy)
 * - perMoleVsPerKg: molar constants used per kilogram, or the reverse (factor M)
 * - signFlipped: work reported in the other sign convention
 */
export interface Slips {
  readonly celsiusForKelvin?: boolean
  readonly cpCvSwapped?: boolean
  readonly gammaSwapped?: boolean
  readonly kiloFactor?: 'input-kJ-as-J' | 'times-1000' | 'divided-by-1000'
  readonly log10ForLn?: boolean
  readonly perMoleVsPerKg?: boolean
  readonly signFlipped?: boolean
}
