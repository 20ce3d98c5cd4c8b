/**
 * What the register workbook says about its own numbers: the methods behind them (each with its
 * formula in words and where it is published), the assumptions, and the cautions. Pure text.
 * The method sources are those named beside the formulas in lib/hazard.
 */

export type MethodStatement = { item: string; statement: string; source: string };

export const METHODS: MethodStatement[] = [
  {
    item: "Antoine equation",
    statement:
      "The saturation vapor pressure is log(P) = A − B / (T + C), with log10 or ln, P and T in the units the coefficients were published for, used within the coefficients' valid temperature range; outside it the result is marked as extrapolated.",
    source: "Antoine (1888); coefficient forms of Poling, Prausnitz & O'Connell, The Properties of Gases and Liquids, 5th ed., App. A, and of the NIST Chemistry WebBook",
  },
  {
    item: "DIPPR equation 101",
    statement: "Where published instead of Antoine coefficients: ln(P / Pa) = C1 + C2 / T + C3 · ln T + C4 · T^C5, with T in kelvin.",
    source: "Perry's Chemical Engineers' Handbook, 8th ed., Table 2-8",
  },
  {
    item: "Wagner equation",
    statement:
      "The library's preferred form where a set is published: ln(P / Pc) = (Tc / T) · Σ nᵢ · τ^tᵢ with τ = 1 − T / Tc, T in kelvin; each set keeps its own exponents (1, 1.5, 2.5, 5 in the \"2.5-5\" form). Dry ice's sublimation line has the same form reduced by the triple point. Sets are chosen so that one set covers −40 … 60 °C; where two sets meet in that span, the curve steps by less than 0.5 %.",
    source:
      "W. Wagner, Cryogenics 13 (1973) 470; coefficient sets of the VDI Heat Atlas, 2nd ed. (2010), chapter D3.1; Poling, Prausnitz & O'Connell, 5th ed., §7-3; Span & Wagner, J. Phys. Chem. Ref. Data 25 (1996) 1509 (CO₂); Wagner & Pruss, J. Phys. Chem. Ref. Data 22 (1993) 783 (water)",
  },
  {
    item: "Clausius–Clapeyron equation",
    statement:
      "Without coefficients for the temperature: ln(P / P₀) = −(ΔHvap / R) · (1 / T − 1 / T₀) from the normal boiling point (P₀ = 101.325 kPa at T₀ = Tb) with a constant enthalpy of vaporization; when that is unknown it is estimated by Trouton's rule, ΔHvap ≈ 88 J/(mol·K) × Tb, and the result says so.",
    source: "Integrated Clausius–Clapeyron equation (e.g. OpenStax Chemistry 2e §10.3; Atkins, Physical Chemistry); Trouton's rule is common practice",
  },
  {
    item: "Warm-up after a failure (time to danger)",
    statement:
      "A refrigerator, freezer or other unit with a set range warms after its cooling fails towards its room's worst case as T(t) = T_room − (T_room − T_start) · e^(−t / τ), from its in-control worst case. τ is set for the unit by a person, else fitted by least squares to the rising part of its own recorded excursions (against its room's readings or design maximum), else the default of its kind. A control-lost finding's time to danger is the time at which the unit reaches the temperature where the finding's severity is first reached: the LFL alarm fraction where Psat(T) / Patm reaches it (the rule solved for T), the flash point or the margin below it, the boiling point; 0 when it is reached already in control. A screening estimate from one time constant.",
    source: "Newton's law of heating (cooling); Levenberg–Marquardt least squares; default τ per kind of unit as on the thresholds page (USDA FSIS \"Keeping Food Safe During an Emergency\" holding times taken as τ, a lower bound)",
  },
  {
    item: "A broken bottle in a closed unit",
    statement:
      "The largest bottle of each liquid with an LFL, spilled inside a closed unit at its in-control worst case: pool area V / 1 cm capped at the unit's floor (the face of a cube of its internal volume), evaporating at the Eq. D-1 rate slowed by the vapor-pressure deficit, so p(t) = Psat · (1 − e^(−t / θ)) with θ = Psat · V · M / (R · T · QR₀), capped by what the bottle holds; the times to 25 % LFL and to the LFL follow.",
    source: "US EPA, RMP Offsite Consequence Analysis Guidance (EPA 550-B-99-009), App. D Eq. D-1, on its mass-transfer basis (Mackay & Matsugu 1973); ideal gas",
  },
  {
    item: "Equilibrium concentration",
    statement:
      "Mole fraction y = Psat / Patm (local atmospheric pressure of the site); ppm = 10⁶ · y; mg/m³ = ppm × M / Vm with Vm = R · T / P, the ideal-gas molar volume (24.45 L/mol at 25 °C and 1 atm).",
    source: "Dalton's law; CCOHS OSH Answers \"Converting occupational exposure limits\"; NIOSH NMAM Appendix A",
  },
  {
    item: "Enclosure bound",
    statement:
      "In a closed unit the vapor concentration cannot exceed the saturation concentration, nor the concentration reached if the releasable liquid evaporated completely into the free volume: C = min(C_sat, m · Vm / (M · V_free)). A maximum possible value, not an expected one.",
    source: "After Popendorf's closed-room worst case (Taylor & Francis, ISBN 9781351238052)",
  },
  {
    item: "EPA RMP pool evaporation",
    statement:
      "Evaporation rate of a spilled pool: QR = 0.284 · U^0.78 · MW^(2/3) · A · VP / (82.05 · T), QR in lb/min, air speed U in m/s, pool area A in ft², vapor pressure VP in mmHg, T in kelvin (converted to g/s).",
    source: "US EPA, Risk Management Program Guidance for Offsite Consequence Analysis (EPA 550-B-99-009), Appendix D, Eq. D-1",
  },
  {
    item: "Mackay–Matsugu evaporation",
    statement:
      "Mass-transfer alternative for the pool: k_m = 0.0292 · U^0.78 · X^(−0.11) · Sc^(−0.67) (k_m and U in m/h, X the pool diameter in m, Sc the Schmidt number); evaporation N = k_m · A · Psat · M / (R · T).",
    source: "D. Mackay and R. S. Matsugu, “Evaporation rates of liquid hydrocarbon spills on land and water”, Can. J. Chem. Eng. (1973); the correlation in the form commonly quoted in process-safety texts (common practice)",
  },
  {
    item: "Well-mixed room model",
    statement:
      "A constant source G in a ventilated room of volume V with airflow Q and mixing factor k: steady state C = G / (k · Q); from clean air C(t) = C_ss · (1 − e^(−k · Q · t / V)); never above the saturation concentration.",
    source: "AIHA, Mathematical Models for Estimating Occupational Exposure to Chemicals, 2nd ed.",
  },
  {
    item: "Raoult's law",
    statement: "Over a liquid mixture each component's partial pressure is its liquid mole fraction times its own saturation vapor pressure: pᵢ = xᵢ · Pᵢsat(T); the total is their sum (ideal solution).",
    source: "Raoult's law for ideal solutions",
  },
  {
    item: "Le Chatelier's rule",
    statement: "The lower flammable limit of a vapor mixture: LFL_mix = 1 / Σ(yᵢ / LFLᵢ), yᵢ the mole fractions of the combustible vapors; the fraction of the LFL of several vapors in one air space is Σ Cᵢ / LFLᵢ.",
    source: "Mashuga & Crowl (2000); Crowl & Louvar, Chemical Process Safety, ch. 6",
  },
  {
    item: "Exposure index",
    statement: "Ratio of the concentration to each exposure limit (TWA, STEL, ceiling, IDLH, mg/m³ limits converted at 25 °C); for several vapors in one enclosure the additive index Σ Cᵢ / Lᵢ, above 1 exceeding the mixture limit.",
    source: "Additive mixture formula of OSHA 29 CFR 1910.1000(d)(2) and ACGIH TLV practice",
  },
];

export function assumptions(lookBackDays: number): MethodStatement[] {
  return [
    {
      item: "Worst-case temperature",
      statement: `For each room and storage unit: the highest of its design maximum, the highest reading of its sensors in the look-back window and the peak of any open excursion. For a unit with a set range, "in control" is the upper end of the range and its sensors' highest reading outside its excursions (an excursion is the unit out of control). The source of the value is given beside it.`,
      source: "Headroom's definition",
    },
    {
      item: "Look-back window",
      statement: `Readings count towards the worst case for ${lookBackDays} days.`,
      source: "Setting worstCaseLookBackDays (default 365 days)",
    },
    {
      item: "Control lost",
      statement: "A temperature-controlled unit (refrigerator, freezer) is also assessed with control lost: at the higher of its room's worst case (as if it had failed and warmed up to the room) and the highest peak of its excursions in the look-back window; never below its in-control worst case.",
      source: "Headroom's definition",
    },
    {
      item: "Spill",
      statement:
        "The spill scenario assumes the contents of a container form a pool on the floor of a ventilated room, spread to a fixed depth unless the settings give another, evaporating at the pool evaporation rate above into the well-mixed room. The pool depth, air speed and duration used are those of the settings listed on this sheet or stated in each finding's trace.",
      source: "Spread depth 1 cm by default (US EPA RMP Offsite Consequence Analysis Guidance, EPA 550-B-99-009)",
    },
    {
      item: "Ideal behaviour",
      statement: "Ideal gas, ideal liquid mixtures (Raoult's law), equilibrium saturation and a well-mixed or closed volume. Concentrations near a spill or release point and during door openings can be much higher than the values shown.",
      source: "Limits of the models named above",
    },
    {
      item: "Inventory",
      statement: "The Inventory sheet lists the containers in storage (every state except disposed of). Findings and their traces are shown as stored at their last evaluation.",
      source: "Headroom's definition",
    },
    {
      item: "Traces",
      statement:
        "Each finding's calculation is one cell of the Finding traces sheet, a line per input (with its value, unit and source), per step (the formula, then the formula with the numbers put in), per result and per warning; a nested calculation is indented under its \"Part\" line. Numbers in the trace are rounded to six significant figures; on the Findings sheet the value, limit and ratio are rounded to three, as the register shows them, and stay numbers. A long source is cited as [S…] and written out once on the Trace sources sheet. Select a trace cell and read it in the formula bar, or make its row taller.",
      source: "Headroom's definition",
    },
    {
      item: "Times",
      statement: "Every date and time in this workbook is in UTC.",
      source: "Headroom's convention",
    },
  ];
}

export const CAUTIONS: MethodStatement[] = [
  {
    item: "Screening estimate, not air monitoring",
    statement:
      "The results are screening estimates calculated from the inventory, properties and temperatures entered, using idealised physical models. They are not measurements and do not replace air monitoring, oxygen or gas detection, or an exposure assessment by a qualified industrial hygienist.",
    source:
      "Headroom's caution. Models have limits: well-mixed models miss local peaks near a release (Jayjock, on the AIHA Mathematical Models book); guidance \"does not substitute for EPA's regulations\" (US EPA, EPA 550-B-99-009)",
  },
  {
    item: "Local codes prevail",
    statement:
      "Exposure limits, flammability classifications and quantity limits differ between jurisdictions and code editions. Fire and building codes are adopted and amended locally: the local code and the authority having jurisdiction (for example the fire marshal or building official) decide compliance.",
    source:
      "NFPA definition of the authority having jurisdiction; WHO TRS 961 Annex 9: \"local legislation and regulations will continue to take precedence\"",
  },
  {
    item: "Qualified people decide",
    statement:
      "Decisions on storage, controls and acceptance of a risk belong to qualified people: a safety officer, an industrial hygienist, a licensed fire-protection engineer or another technically qualified person. When in doubt, do not enter; ventilate and call the safety office.",
    source: "OSHA 29 CFR 1910.1000(e): controls \"must be approved for each particular use by a competent industrial hygienist or other technically qualified person\"",
  },
  {
    item: "The defaults are examples",
    statement:
      "Alarm fractions, quantity limits, spill assumptions and other defaults shipped with Headroom are examples only; each organisation sets its own from its local code and practice.",
    source: "Headroom's settings",
  },
];

/** The caution printed at the top of the Summary sheet. */
export const SUMMARY_CAUTION =
  "Screening estimates from physical models, not air monitoring. Limits and quantity rules differ between jurisdictions: the local code and the authority having jurisdiction prevail. Decisions belong to qualified people. The defaults are examples. See the sheet \"Methods and cautions\".";
