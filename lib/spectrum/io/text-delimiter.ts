// The column separators a text spectrum may use.
/** Column separator of a text spectrum; "whitespace" is any run of spaces and tabs. */
export type TextDelimiter = "tab" | "semicolon" | "comma" | "whitespace";
