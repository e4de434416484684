// How close a line given by hand must sit to a lamp line of the table (the workbench's stated tolerance).

/** A line given by hand must sit this close to a lamp line of the table. */
export const HAND_LINE_MATCH_NM = 0.05;
