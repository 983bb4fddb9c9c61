/**
 * The controlled values of a visit record. Values follow Darwin Core where it has a term
 * (caste: "queen", "worker", "male"); the rest are ours, named plainly.
 */
export const CASTES = ["queen", "worker", "male", "unknown"] as const;
export type Caste = (typeof CASTES)[number];

export const CASTE_LABELS: Record<Caste, string> = { queen: "Queen", worker: "Worker", male: "Male", unknown: "Not sure" };

export const BEE_CONFIDENCES = ["certain", "probable", "unsure"] as const;
export type BeeConfidence = (typeof BEE_CONFIDENCES)[number];
export const BEE_CONFIDENCE_LABELS: Record<BeeConfidence, string> = { certain: "Certain", probable: "Probably", unsure: "Unsure" };

export const BEHAVIORS = ["nectar_foraging", "pollen_collecting", "nest_searching", "resting", "other"] as const;
export type Behavior = (typeof BEHAVIORS)[number];
export const BEHAVIOR_LABELS: Record<Behavior, string> = {
  nectar_foraging: "Drinking nectar",
  pollen_collecting: "Collecting pollen",
  nest_searching: "Searching for a nest",
  resting: "Resting",
  other: "Something else",
};

export const PHOTO_SUBJECTS = ["bee", "plant"] as const;
export type PhotoSubject = (typeof PHOTO_SUBJECTS)[number];

/** What a bee photo shows; verifiers need face, thorax and abdomen to separate look-alikes. */
export const BEE_VIEWS = ["face", "thorax_top", "abdomen_top", "side"] as const;
export type BeeView = (typeof BEE_VIEWS)[number];
export const BEE_VIEW_LABELS: Record<BeeView, string> = {
  face: "Face",
  thorax_top: "Top of thorax",
  abdomen_top: "Top of abdomen",
  side: "Side",
};

/** Darwin Core identificationVerificationStatus values as Visitwort uses them. */
export const DETERMINATION_STATUSES = ["proposed", "confirmed", "corrected", "cannot_be_determined"] as const;
export type DeterminationStatus = (typeof DETERMINATION_STATUSES)[number];
export const DETERMINATION_STATUS_LABELS: Record<DeterminationStatus, string> = {
  proposed: "Proposed",
  confirmed: "Confirmed",
  corrected: "Corrected",
  cannot_be_determined: "Cannot be determined",
};

export const BEE_NOT_SURE_LABEL = "Bombus sp. (not sure)";
