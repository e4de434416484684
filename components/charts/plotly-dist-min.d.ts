// plotly.js-dist-min ships no types of its own; it is the same library as plotly.js, so it takes those.
declare module "plotly.js-dist-min" {
  import Plotly from "plotly.js";
  export default Plotly;
}
