export { AppHeader, MAIN_CONTENT_ID, type AppHeaderProps, type AppHeaderUser } from "./app-header";
export { PageHeader, type PageHeaderProps } from "./page-header";
export { Breadcrumbs, type BreadcrumbItem } from "./breadcrumbs";
export { BearingBackdrop, type BearingBackdropProps } from "./bearing-backdrop";
export { CompassRose, Wordmark, type CompassRoseProps, type WordmarkProps } from "./compass-rose";
export { ThemeToggle, type ThemeChoice } from "./theme-toggle";
export { themeBootScript, THEME_STORAGE_KEY } from "./theme-script";
export { UserMenu, type UserMenuProps } from "./user-menu";
export { NavLinks, type NavLink } from "./nav-links";
