using ModelWatch.Cli;

return await ModelWatchCommandLine.InvokeAsync(args, Console.Out, Console.Error);
