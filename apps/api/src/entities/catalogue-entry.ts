import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/** Every column a search can filter on (property names); the sawyer stands for the yard's position. */
const FILTERED = [
  "speciesSlug",
  "lengthMm",
  "averageWidthMm",
  "minWidthMm",
  "thicknessMm",
  "moisturePct",
  "ready",
  "priceMinor",
  "liveEdge",
  "featureBits",
  "setKind",
  "freight",
  "latitude",
  "longitude",
  "usableLengthMm",
  "usableWidthMm",
  "usableThicknessMm",
  "sawyerId",
];
/** A covering index for one sort order: the sort key, the id (the keyset tie-break), then every filtered column. */
const sortIndex = (sortKey: string) => [sortKey, "listingId", ...FILTERED.filter((column) => column !== sortKey)];

/**
 * One row per live listing, flattened for the buyers' search: every filter is a plain column.
 * Each sort order has a covering index (sort key, id, every filtered column), so a page's ids are
 * found by walking one index without reading rows (see catalogue-sql.ts); distances are worked
 * out per yard, so there is no index on the position. Kept in step by the
 * catalogue service whenever a listing goes live, leaves, or its slabs' figures change.
 */
@Entity({ name: "catalogue_entry" })
@Index("idx_catalogue_newest", sortIndex("publishedAt"))
@Index("idx_catalogue_species_newest", ["speciesSlug", "publishedAt", "listingId"])
@Index("idx_catalogue_price", sortIndex("priceMinor"))
@Index("idx_catalogue_price_per_bf", sortIndex("pricePerBoardFootMinor"))
@Index("idx_catalogue_size", sortIndex("boardFeet"))
/** Yard by yard, for the nearest-first walk (the yards are taken in order of distance). */
@Index("idx_catalogue_yard", sortIndex("sawyerId"))
@Index("idx_catalogue_fit", ["usableLengthMm", "usableWidthMm", "usableThicknessMm"])
/**
 * Every filtered column, species first: the capped result count reads this index alone (no row
 * lookups), so counting up to 1 001 matches touches only small index entries.
 */
@Index("idx_catalogue_filters", FILTERED)
export class CatalogueEntryEntity {
  @PrimaryColumn({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ type: "varchar", length: 120 })
  title: string;

  @Column({ name: "species_slug", type: "varchar", length: 64 })
  speciesSlug: string;

  @Column({ name: "set_kind", type: "varchar", length: 12 })
  setKind: "single" | "sequential" | "bookmatched";

  @Column({ name: "slab_count", type: "smallint" })
  slabCount: number;

  /** Shortest slab of the set, mm. */
  @Column({ name: "length_mm", type: "int" })
  lengthMm: number;

  /** Thinnest slab of the set, mm. */
  @Column({ name: "thickness_mm", type: "int" })
  thicknessMm: number;

  /** Narrowest average width in the set, mm. */
  @Column({ name: "average_width_mm", type: "int" })
  averageWidthMm: number;

  /** Narrowest point of any slab in the set, mm. */
  @Column({ name: "min_width_mm", type: "int" })
  minWidthMm: number;

  /**
   * What the listing yields as a finished top with slab-math's default allowances (ends trimmed,
   * faces flattened; a set glued side by side): the "fits my table" search compares these.
   */
  @Column({ name: "usable_length_mm", type: "int" })
  usableLengthMm: number;

  @Column({ name: "usable_width_mm", type: "int" })
  usableWidthMm: number;

  @Column({ name: "usable_thickness_mm", type: "int" })
  usableThicknessMm: number;

  /** Wettest last reading in the set, %; null when a slab has no reading. */
  @Column({ name: "moisture_pct", type: "double", nullable: true })
  moisturePct: number | null;

  /** Every slab's last reading inside the indoor (kiln-dried) band. */
  @Column({ type: "boolean" })
  ready: boolean;

  @Column({ name: "price_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  priceMinor: number;

  @Column({ name: "price_per_board_foot_minor", type: "int" })
  pricePerBoardFootMinor: number;

  @Column({ type: "char", length: 3 })
  currency: "USD" | "CAD" | "EUR" | "GBP";

  @Column({ name: "board_feet", type: "double" })
  boardFeet: number;

  @Column({ name: "volume_m3", type: "double" })
  volumeM3: number;

  /** The whole set, central estimate (slab-math setWeight). */
  @Column({ name: "weight_kg", type: "double" })
  weightKg: number;

  /** The whole set, high end: never below the heaviest slab's. */
  @Column({ name: "total_weight_high_kg", type: "double" })
  totalWeightHighKg: number;

  /** The heaviest single slab, high end: what the lifting advice is judged on. */
  @Column({ name: "heaviest_slab_high_kg", type: "double" })
  heaviestSlabHighKg: number;

  @Column({ name: "live_edge", type: "varchar", length: 8 })
  liveEdge: "both" | "one" | "none";

  /** Features as bits: crotch 1, burl 2, spalting 4, figure 8 (all of a set's slabs). */
  @Column({ name: "feature_bits", type: "tinyint", unsigned: true })
  featureBits: number;

  @Column({ type: "boolean" })
  freight: boolean;

  @Column({ type: "boolean" })
  pickup: boolean;

  @Column({ type: "varchar", length: 80, nullable: true })
  town: string | null;

  @Column({ name: "yard_name", type: "varchar", length: 80, nullable: true })
  yardName: string | null;

  /** The address of the yard's public page, for the card's link. */
  @Column({ name: "yard_slug", type: "varchar", length: 96, nullable: true })
  yardSlug: string | null;

  /** The yard's visible reviews: how many, and the sum of their 1–5 ratings (kept by the review service; the mean comes from slab-math). */
  @Column({ name: "yard_review_count", type: "int", unsigned: true, default: 0 })
  yardReviewCount: number;

  @Column({ name: "yard_rating_total", type: "int", unsigned: true, default: 0 })
  yardRatingTotal: number;

  @Column({ type: "double", nullable: true })
  latitude: number | null;

  @Column({ type: "double", nullable: true })
  longitude: number | null;

  @Column({ name: "photo_id", type: "char", length: 36, nullable: true })
  photoId: string | null;

  @Column({ name: "photo_alt", type: "varchar", length: 300, nullable: true })
  photoAlt: string | null;

  @Column({ name: "published_at", type: "datetime", precision: 3 })
  publishedAt: Date;
}
