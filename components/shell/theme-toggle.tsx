"use client";
// Switches between the light and dark themes and remembers the choice in this browser.
export function ThemeToggle() {
  return (
    <button
      type="button"
      className="min-h-10 rounded px-2 py-1 text-xs hover:bg-ink-100 sidebar:min-h-0 dark:hover:bg-ink-800"
      onClick={() => {
        const dark = !document.documentElement.classList.contains("dark");
        document.documentElement.classList.toggle("dark", dark);
        localStorage.setItem("emberline-theme", dark ? "dark" : "light");
      }}
    >
      Light / dark
    </button>
  );
}
