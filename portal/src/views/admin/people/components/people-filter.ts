/** The filters of the People table, as they appear in the URL. */
export type PeopleFilter = 'q' | 'role' | 'institutionId' | 'active';
