# Bash completion for indexkeeper. The tool answers itself through System.CommandLine's [suggest]
# directive (commands, options, encoder names), so this file never goes stale when commands change.
# Install: source it from ~/.bashrc, or copy it to /etc/bash_completion.d/indexkeeper.
_indexkeeper_complete() {
    local IFS=$'\n'
    local words
    words=$("${COMP_WORDS[0]}" "[suggest:${COMP_POINT}]" "${COMP_LINE}" 2>/dev/null) || return 0
    COMPREPLY=($(compgen -W "${words}" -- "${COMP_WORDS[COMP_CWORD]}"))
}
complete -o default -F _indexkeeper_complete indexkeeper
