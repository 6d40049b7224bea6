import { buttonClass, inputClass } from "./button";

/** A GET search box for a list page: `q` in the URL, so a search can be linked and reloaded. */
export function SearchForm({
  action,
  label,
  placeholder,
  defaultValue,
}: {
  action: string;
  /** The field's name for screen readers ("Search parts"). */
  label: string;
  placeholder: string;
  defaultValue?: string;
}) {
  const id = `${action.replace(/\W+/g, "")}-search`;
  return (
    <form role="search" className="mb-4 flex max-w-xl gap-2" action={action}>
      <label className="sr-only" htmlFor={id}>
        {label}
      </label>
      <input
        id={id}
        name="q"
        defaultValue={defaultValue}
        placeholder={placeholder}
        className={inputClass}
      />
      <button type="submit" className={buttonClass.secondary}>
        Search
      </button>
    </form>
  );
}
