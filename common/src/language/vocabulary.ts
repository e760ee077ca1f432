/**
 * What the editor offers to complete: the functions and units of the language, with a word on each.
 * Plain data with no engine behind it, so the browser can load it without mathjs; a test checks
 * every entry against the engine so the list cannot drift from what the engine accepts.
 */

export interface VocabularyEntry {
  label: string;
  detail: string;
}

export const LANGUAGE_FUNCTIONS: VocabularyEntry[] = [
  ['sqrt', 'square root'], ['abs', 'magnitude'], ['arg', 'angle of a complex value (rad)'], ['re', 'real part'], ['im', 'imaginary part'], ['conj', 'complex conjugate'],
  ['sin', 'sine'], ['cos', 'cosine'], ['tan', 'tangent'], ['asin', 'inverse sine'], ['acos', 'inverse cosine'], ['atan', 'inverse tangent'], ['atan2', 'atan2(y, x)'],
  ['exp', 'e to the power'], ['log', 'natural logarithm, or log(x, base)'], ['log10', 'common logarithm'], ['max', 'largest'], ['min', 'smallest'], ['sum', 'sum'], ['mean', 'mean'],
  ['round', 'round'], ['floor', 'round down'], ['ceil', 'round up'],
  ['phasor', 'phasor(mag, angle)'], ['polar', 'polar(mag, angle)'], ['rms', 'rms(peak) = peak/√2, one sinusoid'], ['peak', 'peak(rms) = √2·rms, one sinusoid'], ['total_rms', 'total_rms([X_1, X_2, …]) = √ΣX_h²'], ['thd', 'thd([X_1, X_2, …]), IEEE 519'], ['tdd', 'tdd([I_1, I_2, …], I_L), IEEE 519'],
  ['series', 'Z1 + Z2 + …'], ['parallel', '1/(1/Z1 + 1/Z2 + …)'],
  ['reactance_L', 'reactance_L(L, f) = 2πfL'], ['reactance_C', 'reactance_C(C, f) = 1/(2πfC)'], ['impedance_L', 'impedance_L(L, f) = j2πfL'], ['impedance_C', 'impedance_C(C, f) = −j/(2πfC)'],
  ['impedance_RLC', 'impedance_RLC(R, L, C, f), series'], ['resonant_frequency', 'resonant_frequency(L, C) in Hz'], ['natural_frequency', 'natural_frequency(L, C) in rad/s'],
  ['q_factor', 'q_factor(R, L, C), series'], ['damping_ratio', 'damping_ratio(R, L, C)'], ['attenuation', 'attenuation(R, L) = R/(2L)'], ['damped_frequency', 'damped_frequency(R, L, C)'],
  ['critical_resistance', 'critical_resistance(L, C) = 2√(L/C)'], ['rlc_reactance', 'rlc_reactance(L, C, w)'], ['rlc_impedance', 'rlc_impedance(R, L, C, w)'],
  ['rlc_amplitude', 'rlc_amplitude(E0, R, L, C, w)'], ['delay_angle', 'delay_angle(R, L, C, w)'], ['time_lag', 'time_lag(R, L, C, w)'], ['rlc_current', 'rlc_current(t, E0, R, L, C, w)'],
  ['complex_power', 'complex_power(V, I) = V·I*, rms values'], ['apparent_power', 'apparent_power(V, I), rms values'], ['real_power', 'real_power(V, I), rms values'], ['reactive_power', 'reactive_power(V, I), rms values'],
  ['power_factor', 'power_factor(Z or S), or (P, S)'], ['power_factor_sense', 'power_factor_sense(S or Z): lagging or leading'], ['line_voltage', '√3·V_ph'], ['phase_voltage', 'V_LL/√3'], ['power_3ph', 'power_3ph(V_LL, I_L, pf)'],
  ['apparent_power_3ph', 'apparent_power_3ph(V_LL, I_L)'], ['line_current_3ph', 'line_current_3ph(S, V_LL)'], ['bank_reactive_power', 'bank_reactive_power(C, V, f), one capacitor'],
  ['bank_capacitance', 'bank_capacitance(Q, V, f), one capacitor'], ['resonance_order', 'resonance_order(S_sc, Q_c)'], ['resonance_order_tr', 'resonance_order_tr(S_tr, z_percent, Q_c, S_sc)'],
  ['tuning_order', 'tuning_order(p) = 1/√p'], ['detuned_voltage_rise', 'detuned_voltage_rise(p) = 1/(1 − p)'], ['per_unit', 'per_unit(x, base)'],
  ['base_impedance', 'base_impedance(V, S) = V²/S'], ['base_current_3ph', 'base_current_3ph(S, V)'],
].map(([label, detail]) => ({ label, detail }));

export const LANGUAGE_UNITS: VocabularyEntry[] = [
  ['V', 'volt'], ['kV', 'kilovolt'], ['mV', 'millivolt'], ['A', 'ampere'], ['kA', 'kiloampere'], ['mA', 'milliampere'],
  ['ohm', 'ohm'], ['kohm', 'kilohm'], ['mohm', 'milliohm'], ['S', 'siemens'], ['F', 'farad'], ['uF', 'microfarad'], ['nF', 'nanofarad'], ['pF', 'picofarad'],
  ['H', 'henry'], ['mH', 'millihenry'], ['uH', 'microhenry'], ['Hz', 'hertz'], ['kHz', 'kilohertz'], ['MHz', 'megahertz'],
  ['W', 'watt'], ['kW', 'kilowatt'], ['MW', 'megawatt'], ['VA', 'volt-ampere'], ['kVA', 'kilovolt-ampere'], ['MVA', 'megavolt-ampere'], ['var', 'var (reactive power)'], ['kvar', 'kilovar'], ['Mvar', 'megavar'],
  ['J', 'joule'], ['kJ', 'kilojoule'], ['C', 'coulomb'], ['s', 'second'], ['ms', 'millisecond'], ['us', 'microsecond'],
  ['rad', 'radian'], ['deg', 'degree'], ['rad/s', 'radian per second'], ['Wb', 'weber'], ['T', 'tesla'], ['m', 'metre'], ['mm', 'millimetre'], ['mm^2', 'square millimetre'], ['K', 'kelvin'], ['degC', 'degree Celsius'],
].map(([label, detail]) => ({ label, detail }));

export const LANGUAGE_CONSTANTS: VocabularyEntry[] = [['pi', 'π'], ['e', "Euler's number"], ['j', 'imaginary unit'], ['i', 'imaginary unit']].map(([label, detail]) => ({ label, detail }));

/** Keywords of a calc line. */
export const LANGUAGE_KEYWORDS = ['to'];

/** The names a calc source defines, in order (`name = expression` at the start of a line). */
export function namesDefinedIn(source: string): string[] {
  return [...source.matchAll(/^\s*([A-Za-z_][A-Za-z0-9_]*)\s*=(?!=)/gm)].map((m) => m[1]);
}
