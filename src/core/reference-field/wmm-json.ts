/**
 * World Magnetic Model coefficients from the JSON layout shipped with the `geomagnetism` npm package
 * (data/wmm-2025.json): triangular arrays main_field_coeff_g/h (nT) and secular_var_coeff_g/h (nT/year)
 * indexed n(n+1)/2 + m, with n_max, n_max_sec_var, epoch and name. A WMM is valid for 5 years from its
 * epoch (NOAA/BGS WMM2025 technical report).
 */
import { z } from "zod";
import { ModelFormatError } from "./errors";
import { coefficientCount, highestNonZeroDegree, type CoefficientSet, type FieldModel } from "./model";

/** Validity span of a World Magnetic Model release, years. */
export const WMM_VALIDITY_YEARS = 5;

const finiteArray = z.array(z.number().finite());
const WmmJsonSchema = z.object({
  name: z.string().optional(),
  epoch: z.number().finite(),
  n_max: z.number().int().min(1).max(30),
  n_max_sec_var: z.number().int().min(0).max(30),
  main_field_coeff_g: finiteArray,
  main_field_coeff_h: finiteArray,
  secular_var_coeff_g: finiteArray,
  secular_var_coeff_h: finiteArray,
});

function triangular(values: number[], arrayDegree: number, field: string): Float64Array {
  const size = coefficientCount(arrayDegree);
  if (values.length < size) {
    throw new ModelFormatError(`WMM coefficients: ${field} has ${values.length} values, degree ${arrayDegree} needs ${size}`);
  }
  return Float64Array.from(values.slice(0, size));
}

/** Name as Fieldtide writes it: "WMM-2025" → "WMM2025". */
function modelName(raw: string | undefined, epoch: number): string {
  const match = raw ? /^WMM-?(\d{4})$/i.exec(raw.trim()) : null;
  return match ? `WMM${match[1]}` : raw?.trim() || `WMM${Math.round(epoch)}`;
}

/** Build a FieldModel from parsed WMM JSON; throws ModelFormatError when the shape is wrong. */
export function modelFromWmmJson(json: unknown): FieldModel {
  const parsed = WmmJsonSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new ModelFormatError(`WMM coefficients: ${issue.path.join(".") || "document"}: ${issue.message}`);
  }
  const doc = parsed.data;
  const arrayDegree = doc.n_max;
  const g = triangular(doc.main_field_coeff_g, arrayDegree, "main_field_coeff_g");
  const h = triangular(doc.main_field_coeff_h, arrayDegree, "main_field_coeff_h");
  const svG = triangular(doc.secular_var_coeff_g, arrayDegree, "secular_var_coeff_g");
  const svH = triangular(doc.secular_var_coeff_h, arrayDegree, "secular_var_coeff_h");
  // Secular variation beyond n_max_sec_var is defined as zero.
  for (let k = coefficientCount(Math.min(doc.n_max_sec_var, arrayDegree)); k < svG.length; k++) {
    svG[k] = 0;
    svH[k] = 0;
  }
  const secularVariation: CoefficientSet = { g: svG, h: svH, maxDegree: highestNonZeroDegree(svG, svH, arrayDegree) };
  const name = modelName(doc.name, doc.epoch);
  return {
    name,
    version: String(Math.round(doc.epoch)),
    validFromYear: doc.epoch,
    validToYear: doc.epoch + WMM_VALIDITY_YEARS,
    arrayDegree,
    epochs: [{ year: doc.epoch, g, h, maxDegree: highestNonZeroDegree(g, h, arrayDegree) }],
    secularVariation,
    degreeConvention: "full",
  };
}
