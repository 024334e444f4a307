import type { SyllabusStageInput } from "../access/syllabus/create-revision";

// The invented demo scenario: a fictional school, people and numbers of our own.
export const DEMO_PASSWORD = "chalkwing-demo";

export const DEMO_SCHOOL = {
  name: "Larkhollow Flying School",
  timeZone: "Europe/London",
  authority: "Larkhollow regional training standard (fictional)",
};

const s = (name: string, email?: string) => ({ name, email: email ?? `${name.toLowerCase().replace(/[^a-z]+/g, ".")}@chalkwing.test` });

export const COHORT_A_STUDENTS = [
  s("Ada Quill", "student@chalkwing.test"),
  s("Noor Brandt", "noor.brandt@chalkwing.test"),
  s("Kofi Mensah"),
  s("Elin Haugen"),
  s("Mateo Ferreira"),
  s("Saoirse Dunleavy"),
  s("Yusuf Karaca"),
  s("Hana Watanabe"),
  s("Callum Reay"),
  s("Beatriz Solano"),
  s("Ivo Petrak"),
  s("Maren Tofte"),
];

export const COHORT_B_STUDENTS = [
  s("Lotte Lindqvist"),
  s("Dev Raghunathan"),
  s("Amara Eze"),
  s("Finnian Cole"),
  s("Zofia Wrobel"),
  s("Tariq Haddad"),
  s("Greta Vos"),
  s("Oisin Mallory"),
  s("Leilani Kahale"),
  s("Bruno Castell"),
  s("Wren Ashdown"),
  s("Esme Oduya"),
];

export const DEMO_STAGES: SyllabusStageInput[] = [
  {
    code: "AER",
    title: "Principles of flight: drag and speed",
    items: [
      {
        code: "AER-01",
        title: "Zero-lift drag and its parts",
        objective: "Explain skin-friction, form and interference drag and how zero-lift drag grows with the square of speed.",
        completionStandard: "Names the three parts with an example of each and states that doubling the speed quadruples zero-lift drag.",
        requiredLevel: "understanding",
      },
      {
        code: "AER-02",
        title: "Lift-dependent drag",
        objective: "Explain why lift-dependent drag falls as speed rises in level flight, and the effect of aspect ratio and weight.",
        completionStandard: "Relates lift-dependent drag to lift coefficient, aspect ratio and mass, and sketches it against speed.",
        requiredLevel: "understanding",
      },
      {
        code: "AER-03",
        title: "Total drag and the minimum-drag speed",
        objective: "Build the total-drag curve from its two parts and locate Vmd, the speed of best L/D.",
        completionStandard:
          "Locates Vmd where the two drags are equal, states the effect of mass and configuration on it, and computes it for a given aircraft.",
        requiredLevel: "application",
      },
      {
        code: "AER-04",
        title: "Speed stability",
        objective: "Explain why a speed below Vmd is speed-unstable at constant thrust and what a gust does on each side of Vmd.",
        completionStandard:
          "Predicts the aircraft's response to a speed disturbance on either side of Vmd and links it to approach flying.",
        requiredLevel: "correlation",
      },
      {
        code: "AER-05",
        title: "Power required and the minimum-power speed",
        objective: "Derive the power-required curve from drag and locate Vmp below Vmd.",
        completionStandard: "States that Vmp is slower than Vmd (about 0.76 Vmd) and explains its use for endurance.",
        requiredLevel: "understanding",
      },
    ],
  },
  {
    code: "ATM",
    title: "The atmosphere and airspeeds",
    items: [
      {
        code: "ATM-01",
        title: "The standard atmosphere",
        objective: "Describe the ISA and its lapse rate to the tropopause.",
        completionStandard: "Quotes sea-level ISA values and the lapse rate, and finds ISA temperature at a given altitude.",
        requiredLevel: "rote",
      },
      {
        code: "ATM-02",
        title: "Pressure and density altitude",
        objective: "Find density altitude from pressure altitude and temperature.",
        completionStandard: "Computes density altitude within 200 ft and explains its effect on performance.",
        requiredLevel: "application",
      },
      {
        code: "ATM-03",
        title: "IAS, EAS and TAS",
        objective: "Relate indicated, equivalent and true airspeed through air density.",
        completionStandard: "Converts EAS to TAS at altitude and explains why drag depends on EAS.",
        requiredLevel: "application",
      },
    ],
  },
  {
    code: "PRF",
    title: "Performance and gliding",
    items: [
      {
        code: "PRF-01",
        title: "Stall speed and load factor",
        objective: "Relate stall speed to mass, CLmax and load factor.",
        completionStandard: "Computes the stall speed in a level turn at a given bank angle.",
        requiredLevel: "application",
      },
      {
        code: "PRF-02",
        title: "Best glide",
        objective: "Relate best glide speed and glide ratio to (L/D)max.",
        completionStandard: "Estimates still-air glide distance from a height and states the effect of mass.",
        requiredLevel: "application",
      },
      {
        code: "PRF-03",
        title: "Configuration effects",
        objective: "Explain how gear and flap change drag, Vmd and stall speed.",
        completionStandard: "Predicts the shift of the drag curve when gear or flap is lowered.",
        requiredLevel: "correlation",
      },
    ],
  },
];
