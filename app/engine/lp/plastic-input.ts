// The plastic-design LP's data, independent of the model file: the caller resolves groups,
// combinations and units (from-model.ts does it for a model).

/** One case the design must carry: a load case, or a strength combination already summed. */
export interface PlasticCase {
  id: string;
  loads: Float64Array; // nNodes*3, model force units
  selfWeight: number; // factor on the structure's own weight (0: none)
}

/** The LP's data, independent of the model file: the caller resolves groups, combinations and units. */
export interface PlasticDesignInput {
  dim: 2 | 3;
  nodeIds: string[];
  memberIds: string[];
  coords: Float64Array; // nNodes*3
  fixed: Uint8Array; // nNodes*3, 1 = restrained (z always restrained in 2D)
  start: Int32Array;
  end: Int32Array;
  density: Float64Array; // mass per length cubed
  allowTension: Float64Array; // Infinity: no limit on that side; 0: the member cannot carry it
  allowCompression: Float64Array;
  memberVar: Int32Array; // member -> area variable
  varIds: string[];
  cases: PlasticCase[];
  /** weight of one mass unit in the force unit (standard gravity expressed in model units) */
  weightPerMass: number;
}

