/**
 * Demo accounts of the invented company Keelwater Instruments (addresses on the reserved
 * .example domain). Every demo account signs in with DEMO_PASSWORD; README lists them.
 */
export const DEMO_PASSWORD = "keelwater-demo";

export const DEMO_TEAM_NAME = "Keelwater Instruments";

export const DEMO_PEOPLE = {
  admin: { name: "Maren Holt", email: "maren@keelwater.example", teamRole: "admin" },
  engineerA: { name: "Tobias Lind", email: "tobias@keelwater.example", teamRole: "engineer" },
  engineerB: { name: "Ines Varga", email: "ines@keelwater.example", teamRole: "engineer" },
  reviewer: { name: "Ruth Okafor", email: "ruth@keelwater.example", teamRole: "reviewer" },
  /** outside the team; holds a viewer share on the hull vibration chain only */
  outsider: { name: "Sam Ostrander", email: "sam@harbourtest.example", teamRole: null },
} as const;
