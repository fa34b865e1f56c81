/**
 * Does a slab (or a glued set of slabs) yield a finished table top? And how many seats?
 * All allowances here are common practice, not a standard.
 */
import { SlabMathError, requireNumberInRange, requirePositive } from "./errors.ts";
import { minimumWidthBetween, slabGeometry } from "./geometry.ts";
import { LIMITS } from "./limits.ts";

/** Default thickness lost to flattening cup and twist, mm in total (common practice). */
export const DEFAULT_FLATTENING_ALLOWANCE_MM = 6;
/** Default length trimmed from each end for end checks, mm (common practice). */
export const DEFAULT_END_TRIM_MM = 50;
/** Default width lost per glued edge when jointing slabs side by side, mm (common practice). */
export const DEFAULT_JOINTING_ALLOWANCE_MM = 5;
/** Table edge per diner, mm (common practice: about 600 mm of elbow room). */
export const EDGE_PER_DINER_MM = 600;

/** A slab as measured. */
export interface SlabDimensions {
  lengthMm: number;
  thicknessMm: number;
  /** Widths at evenly spaced stations from one end to the other, mm (≥ 2). */
  widthStationsMm: readonly number[];
}

/** A finished top. */
export interface TableTop {
  lengthMm: number;
  /** Width needed, mm. */
  widthMm: number;
  thicknessMm: number;
  /** Keep the live edge, or trim the edges straight (default keep_live_edge). */
  edge?: "keep_live_edge" | "trim_straight";
}

/** Allowances (defaults above). */
export interface FitAllowances {
  flatteningAllowanceMm?: number;
  endTrimMm?: number;
  /** Only for glued sets: width lost at each glued edge. */
  jointingAllowanceMm?: number;
}

/** Why a top does not fit. */
export type TableFitReason = "too_short" | "too_narrow" | "too_thin";

/** Information about how the fit was judged. */
export type TableFitNote =
  /** Live edge kept: the usable width is the narrowest width over the usable length. */
  | "live_edge_uses_minimum_width"
  /** Trimmed straight: the straight top is no wider than the narrowest width over the usable length. */
  | "straight_edges_use_minimum_width"
  /** Glued set: widths were added side by side, less the jointing allowance. */
  | "glued_widths_summed";

/** Result of {@link tableFit} and {@link gluedTableFit}. */
export interface TableFit {
  fits: boolean;
  /** Usable minus needed, mm (negative when short). */
  spareLengthMm: number;
  spareWidthMm: number;
  spareThicknessMm: number;
  reasons: TableFitReason[];
  notes: TableFitNote[];
}

function readAllowances(allowances: FitAllowances) {
  return {
    flattening: requireNumberInRange(
      allowances.flatteningAllowanceMm ?? DEFAULT_FLATTENING_ALLOWANCE_MM,
      "flatteningAllowanceMm",
      0,
      LIMITS.maximumThicknessMm,
      "mm",
    ),
    endTrim: requireNumberInRange(allowances.endTrimMm ?? DEFAULT_END_TRIM_MM, "endTrimMm", 0, LIMITS.maximumLengthMm / 2, "mm"),
    jointing: requireNumberInRange(
      allowances.jointingAllowanceMm ?? DEFAULT_JOINTING_ALLOWANCE_MM,
      "jointingAllowanceMm",
      0,
      LIMITS.maximumWidthMm,
      "mm",
    ),
  };
}

function readTop(top: TableTop) {
  if (!top) throw new SlabMathError("missing_input", "top", "top is needed: { lengthMm, widthMm, thicknessMm }");
  return {
    length: requirePositive(top.lengthMm, "top.lengthMm", LIMITS.maximumLengthMm, "mm"),
    width: requirePositive(top.widthMm, "top.widthMm", LIMITS.maximumWidthMm * 4, "mm"),
    thickness: requirePositive(top.thicknessMm, "top.thicknessMm", LIMITS.maximumThicknessMm, "mm"),
    edge: top.edge ?? "keep_live_edge",
  };
}

/** Usable length, thickness and width of one slab after end trimming and flattening. */
function usableSlab(slab: SlabDimensions, field: string, endTrim: number, flattening: number) {
  try {
    slabGeometry(slab); // validates every field of the slab
  } catch (error) {
    if (error instanceof SlabMathError) {
      throw new SlabMathError(error.code, `${field}.${error.field}`, `${field}.${error.message}`);
    }
    throw error;
  }
  const length = slab.lengthMm - 2 * endTrim;
  const width = length > 0 ? minimumWidthBetween(slab.lengthMm, slab.widthStationsMm, endTrim, slab.lengthMm - endTrim) : 0;
  return { length, width, thickness: slab.thicknessMm - flattening };
}

function judge(
  usable: { length: number; width: number; thickness: number },
  top: { length: number; width: number; thickness: number },
  notes: TableFitNote[],
): TableFit {
  const spareLengthMm = usable.length - top.length;
  const spareWidthMm = usable.width - top.width;
  const spareThicknessMm = usable.thickness - top.thickness;
  const reasons: TableFitReason[] = [];
  if (spareLengthMm < 0) reasons.push("too_short");
  if (spareWidthMm < 0) reasons.push("too_narrow");
  if (spareThicknessMm < 0) reasons.push("too_thin");
  return { fits: reasons.length === 0, spareLengthMm, spareWidthMm, spareThicknessMm, reasons, notes };
}

/**
 * Whether one slab yields a finished top after trimming both ends (default 50 mm each for end
 * checks), flattening (default 6 mm total for cup and twist) and the edge choice. Both edge
 * choices use the narrowest width over the usable length (conservative: the top may sit
 * anywhere in the usable length); the note says which.
 */
export function tableFit(slab: SlabDimensions, top: TableTop, allowances: FitAllowances = {}): TableFit {
  const { flattening, endTrim } = readAllowances(allowances);
  const wanted = readTop(top);
  const usable = usableSlab(slab, "slab", endTrim, flattening);
  const note: TableFitNote = wanted.edge === "trim_straight" ? "straight_edges_use_minimum_width" : "live_edge_uses_minimum_width";
  return judge(usable, wanted, [note]);
}

/**
 * Whether a set of slabs glued side by side (e.g. a bookmatched pair) yields a top: usable
 * width is the sum of each slab's narrowest usable width less the jointing allowance at each
 * glued edge (two per joint); usable length and thickness are those of the shortest and
 * thinnest slab.
 */
export function gluedTableFit(slabs: readonly SlabDimensions[], top: TableTop, allowances: FitAllowances = {}): TableFit {
  if (!Array.isArray(slabs) || slabs.length < 1) {
    throw new SlabMathError("missing_input", "slabs", "slabs must list at least one slab");
  }
  const { flattening, endTrim, jointing } = readAllowances(allowances);
  const wanted = readTop(top);
  let length = Infinity;
  let thickness = Infinity;
  let width = 0;
  slabs.forEach((slab, index) => {
    const usable = usableSlab(slab, `slabs[${index}]`, endTrim, flattening);
    length = Math.min(length, usable.length);
    thickness = Math.min(thickness, usable.thickness);
    width += usable.width;
  });
  width -= 2 * jointing * (slabs.length - 1);
  const edgeNote: TableFitNote = wanted.edge === "trim_straight" ? "straight_edges_use_minimum_width" : "live_edge_uses_minimum_width";
  return judge({ length, width, thickness }, wanted, [edgeNote, "glued_widths_summed"]);
}

/**
 * About how many people a rectangular top seats at ~600 mm of edge per diner (common
 * practice): floor(length / 600) along each long side plus floor(width / 600) at each end.
 */
export function seatsAbout(lengthMm: number, widthMm: number): number {
  const length = requirePositive(lengthMm, "lengthMm", LIMITS.maximumLengthMm, "mm");
  const width = requirePositive(widthMm, "widthMm", LIMITS.maximumWidthMm * 4, "mm");
  const longSide = Math.max(length, width);
  const shortSide = Math.min(length, width);
  return 2 * Math.floor(longSide / EDGE_PER_DINER_MM) + 2 * Math.floor(shortSide / EDGE_PER_DINER_MM);
}

/**
 * Length of top for a number of diners along the two long sides (≈600 mm each, common
 * practice); `endSeats` diners seated at the ends need no extra length.
 */
export function topLengthForSeats(seats: number, endSeats = 0): number {
  if (!Number.isInteger(seats) || seats < 1 || seats > 40) {
    throw new SlabMathError("out_of_range", "seats", `seats must be a whole number from 1 to 40, got ${seats}`);
  }
  if (!Number.isInteger(endSeats) || endSeats < 0 || endSeats > 2 || endSeats >= seats) {
    throw new SlabMathError("out_of_range", "endSeats", `endSeats must be 0, 1 or 2 and fewer than seats, got ${endSeats}`);
  }
  return Math.ceil((seats - endSeats) / 2) * EDGE_PER_DINER_MM;
}
