// A valid example budget (the example of docs/motion-conventions.md section 7), for tests that need
// a budget that is not the product's own demo budget.
export const EXAMPLE_BUDGET = {
  strokeMargin_m: 0.02,
  envelope: {
    x: [
      [0, -1.0, 1.0],
      [1.0, -0.5, 0.5],
    ],
    y: [[0, -0.8, 0.8]],
    z: [[0, 0.2, 1.8]],
  },
  comfort: {
    jerkMax_mps3: 25,
    angularSpeedMax_radps: 0.7,
    angularAccelMax_radps2: 4,
    msdvZMax_mps1_5: 12,
    wrmsMax_mps2: 0.8,
  },
};
