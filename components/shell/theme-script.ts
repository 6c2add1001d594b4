// Not in the "use client" file, so the root layout (a server component) can import the strings.
export const THEME_STORAGE_KEY = "portolan-theme";

/** Applies a stored theme choice before first paint; the root layout inlines it in <head>. */
export const themeBootScript = `try{var t=localStorage.getItem("${THEME_STORAGE_KEY}");if(t==="light"||t==="dark")document.documentElement.dataset.theme=t}catch(e){}`;
