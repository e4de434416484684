// plotly.js-basic-dist-min ships no types of its own; it is plotly.js with only the scatter, bar and pie
// traces (every chart here is a scatter), so it takes plotly.js's types.
declare module "plotly.js-basic-dist-min" {
  import Plotly from "plotly.js";
  export default Plotly;
}
