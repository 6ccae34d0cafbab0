/**
 * The demo scenario's people: invented staff of the invented "Copperwren Geophysics".
 * One list serves the seed, `npm run demo` (which prints it) and the README.
 */
export interface DemoSignIn {
  email: string;
  password: string;
  name: string;
  summary: string;
}

export const DEMO_SIGN_INS: DemoSignIn[] = [
  { email: "admin@copperwren.example", password: "fieldtide-admin", name: "Ada Ferrow", summary: "organisation admin" },
  { email: "lead@copperwren.example", password: "fieldtide-lead", name: "Lewin Marsh", summary: "lead on BRM-26, SDK-26 and OLD-25" },
  { email: "processor@copperwren.example", password: "fieldtide-processor", name: "Priya Lantern", summary: "processor on BRM-26 and SDK-26" },
  { email: "crew@copperwren.example", password: "fieldtide-crew", name: "Tomas Quill", summary: "crew on BRM-26" },
  { email: "reviewer@copperwren.example", password: "fieldtide-reviewer", name: "Rhea Okonjo", summary: "reviewer on SDK-26" },
];
