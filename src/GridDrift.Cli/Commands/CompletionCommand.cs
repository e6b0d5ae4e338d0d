using System.CommandLine;

namespace GridDrift.Cli.Commands;

/// <summary>
/// `griddrift completion bash|zsh|fish`: a shell script that completes commands, options and
/// their values by asking griddrift itself, through System.CommandLine's <c>[suggest:POSITION]</c>
/// directive, so completion never drifts from the command line it completes.
/// </summary>
public static class CompletionCommand
{
    public static Command Build()
    {
        var shell = new Argument<string>("SHELL") { Description = "bash, zsh or fish" };
        shell.AcceptOnlyFromAmong("bash", "zsh", "fish");
        var command = new Command("completion", "Print a tab-completion script for a shell; load it from the shell's start-up file (docs/install.md).\n\n" +
            "Examples:\n  griddrift completion bash >> ~/.bashrc\n  griddrift completion zsh > \"${fpath[1]}/_griddrift\"\n  griddrift completion fish > ~/.config/fish/completions/griddrift.fish") { shell };
        command.SetAction(parse =>
        {
            parse.InvocationConfiguration.Output.Write(Script(parse.GetValue(shell)!));
            return ExitCodes.Success;
        });
        return command;
    }

    public static string Script(string shell) => shell switch
    {
        "bash" => """
            # griddrift tab completion for bash: griddrift completes its own command line
            _griddrift_complete() {
                local IFS=$'\n'
                COMPREPLY=($(griddrift "[suggest:${COMP_POINT}]" "${COMP_LINE}" 2>/dev/null))
            }
            complete -o default -F _griddrift_complete griddrift

            """,
        "zsh" => """
            #compdef griddrift
            # griddrift tab completion for zsh: griddrift completes its own command line
            _griddrift() {
                local -a suggestions
                suggestions=("${(@f)$(griddrift "[suggest:${CURSOR}]" "${BUFFER}" 2>/dev/null)}")
                compadd -a suggestions
            }
            compdef _griddrift griddrift

            """,
        "fish" => """
            # griddrift tab completion for fish: griddrift completes its own command line
            complete -c griddrift -f -a '(set -l line (commandline -cp); griddrift "[suggest:"(string length -- "$line")"]" "$line" 2>/dev/null)'

            """,
        _ => throw new ArgumentOutOfRangeException(nameof(shell)),
    };
}
