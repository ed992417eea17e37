"""The epilog and each subcommand's exit-status text shown by --help."""

EPILOG = """\
examples:
  docgen new my-supply.toml            write a commented starter requirements file
  docgen new --regulator follower -    print the starter for an emitter follower
  docgen check specs/my-supply.toml    size and check; prints failing and marginal checks
  docgen check --format json spec.toml one JSON verdict on stdout, for CI
  docgen build specs/ -o out           build every spec in a folder into out/<name>/
  docgen diff old.toml new.toml        what a requirements change did to the design
  docgen diff spec.toml --rev HEAD     the same against the file at a git revision
  docgen schema requirements           JSON Schema of the requirements file, for editors
  docgen completion bash               shell completion script (bash or zsh)

exit status: 0 all checks pass, 1 a check fails or the design is infeasible,
             2 invalid input or unwritable output. Each command's help gives its own.

Safety: docgen estimates; it does not approve. Mains work must follow local codes
and be checked by a qualified person.
"""

CHECK_EXIT = """\
exit status:
  0  every check passes (warnings allowed unless --strict)
  1  a check fails, a warning with --strict, or a design is infeasible
  2  a spec is invalid or cannot be read (the message names file and field)

With --format json the verdict of every spec is one JSON object on stdout
(docs/cli-json.md); SPEC '-' reads the requirements from standard input.
"""

BUILD_EXIT = """\
exit status:
  0  every check passes (warnings allowed unless --strict)
  1  a check fails, a warning with --strict, or a design is infeasible
  2  a spec is invalid or an output could not be written

Every spec is validated before the first build starts. Stage progress is shown
on standard error when it is a terminal; -v adds each stage's time.
"""

DIFF_EXIT = """\
exit status:
  0  nothing changed
  1  something changed (requirements, values, parts, checks, cautions or status)
  2  invalid input (a spec, the revision, or the arguments)
"""

NEW_EXIT = """\
exit status:
  0  the starter was printed or written
  2  PATH exists (never overwritten) or cannot be written

PATH '-' (or no PATH) prints the starter on standard output.
"""

SCHEMA_EXIT = """\
exit status:
  0  the schema was printed

The same files are published as docs/schema/*.schema.json.
"""

COMPLETION_EXIT = """\
exit status:
  0  the script was printed

bash:  docgen completion bash > ~/.local/share/bash-completion/completions/docgen
zsh:   docgen completion zsh > "${fpath[1]}/_docgen"   (a folder on your $fpath)
"""
