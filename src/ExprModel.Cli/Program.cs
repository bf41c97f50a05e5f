using ExprModel.Cli.Commands;

namespace ExprModel.Cli;

public static class Program
{
    public static int Main(string[] args) => CliApp.Run(args, Console.Out, Console.Error);
}
