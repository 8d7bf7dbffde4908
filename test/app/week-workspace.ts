// Invented demo workspace shared by the week-plan tests of the service and of the chat app: two
// people in Lisbon, one in Halifax, two rooms, two series.

/** Tuesday 2026-12-01 18:00 UTC: next week is 2026-W50 (Monday 2026-12-07). */
export const WEEK_NOW = Date.parse('2026-12-01T18:00:00Z');

/** The workspace.yaml text, with its name and its `weekPlan:` mapping as given. */
export function weekWorkspaceYaml(name: string, weekPlan: string): string {
  return `name: ${name}
zone: Europe/Lisbon
grid: 15
workingHours: {mon: ["09:00-17:00"], tue: ["09:00-17:00"], wed: ["09:00-17:00"], thu: ["09:00-17:00"], fri: ["09:00-17:00"]}
admins: [ines]
people:
  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, chat: U0DEMO006, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, email: rui@saltline.example, chat: U0DEMO007, zone: Europe/Lisbon}
  - {id: teo, name: Teo Brannigan, email: teo@saltline.example, chat: U0DEMO002, zone: America/Halifax}
rooms:
  - {id: tejo, name: Tejo, capacity: 10, features: [screen, phone], zone: Europe/Lisbon}
  - {id: sounding, name: Sounding, capacity: 3, features: [whiteboard], zone: Europe/Lisbon}
series:
  - {id: survey-sync, name: Survey sync, attendees: [ines, rui, teo], minutes: 45, sessions: 2, minDays: 2, room: {features: [phone]}}
  - {id: ines-rui, name: Ines and Rui one-to-one, attendees: [ines, rui], minutes: 30, room: {features: [whiteboard]}}
weekPlan: ${weekPlan}
`;
}
