/** Competition shapes shared by the server modules and the components. */

/** A compo as lists show it (home page, event page, "My entries"). */
export interface CompetitionCard {
  id: string;
  slug: string;
  title: string;
  state: string;
  deadlineAt: string | null;
  eventSlug: string;
  eventTitle: string;
  timeZone: string;
}
